import { z } from 'zod';

export const mailStates = ['queued', 'sending', 'sent', 'failed'] as const;
export type MailState = (typeof mailStates)[number];

/** GET /api/admin/mail-queue: filter by state, newest first, paged. */
export const mailQueueQuerySchema = z.object({
  state: z.enum(mailStates, { message: 'must be one of queued, sending, sent, failed' }).optional(),
  page: z.coerce.number().int().min(1).max(10_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
});
export type MailQueueQuery = z.infer<typeof mailQueueQuerySchema>;

export type MailServiceAnswer = { id: string } | { status: number | null; name: string; message: string; retryAfterSeconds?: number };

export type MailQueueEntry = {
  id: string;
  template: string;
  to: string;
  category: 'transactional' | 'dispatch';
  state: MailState;
  attempts: number;
  nextAttemptAt: string;
  providerId: string | null;
  answer: MailServiceAnswer | null;
  sentAt: string | null;
  createdAt: string;
  updatedAt: string;
};

export type MailQueuePage = {
  entries: MailQueueEntry[];
  page: number;
  pageSize: number;
  total: number;
  counts: Record<MailState, number>;
};
