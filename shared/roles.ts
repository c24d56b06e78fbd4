// The account roles in their fixed order, apart from the zod schemas so the browser can use them without zod.
export const roles = ['backer', 'outreach', 'engineer', 'finance', 'admin'] as const;
export type Role = (typeof roles)[number];
