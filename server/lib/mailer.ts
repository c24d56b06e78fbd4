// What the server needs from the mail path (emails/send.ts implements it over the resend SDK).
export type Mailer = {
  send: (template: string, to: string, data: Record<string, unknown>, options?: { idempotencyKey?: string }) => Promise<{ id: string }>;
};
