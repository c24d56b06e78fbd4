export const adminKeys = {
  all: ['admin'] as const,
  accounts: () => [...adminKeys.all, 'accounts'] as const,
  accountList: (q: string) => [...adminKeys.accounts(), { q }] as const,
  audit: () => [...adminKeys.all, 'audit'] as const,
  auditList: (limit: number) => [...adminKeys.audit(), { limit }] as const,
};
