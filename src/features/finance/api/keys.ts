export const booksKeys = {
  all: ['books'] as const,
  dashboard: () => [...booksKeys.all, 'dashboard'] as const,
  runs: () => [...booksKeys.all, 'runs'] as const,
  run: (id: string) => [...booksKeys.runs(), id] as const,
  pledges: (q: string) => [...booksKeys.all, 'pledges', q] as const,
  pledge: (id: string) => [...booksKeys.all, 'pledge', id] as const,
  months: () => [...booksKeys.all, 'months'] as const,
  month: (month: string) => [...booksKeys.months(), month] as const,
  disputes: () => [...booksKeys.all, 'disputes'] as const,
};
