import { useState, type ReactNode } from 'react';
import { QueryClientProvider, type QueryClient } from '@tanstack/react-query';
import { ToastProvider } from '@/components/ui/toast';
import { createQueryClient } from '@/lib/query-client';
import { getMeQueryOptions } from '@/features/auth/api/get-me';

/** The app's query client. A 401 anywhere means the session is gone: forget the account, and the guards on
 * protected layouts send the visitor to sign-in with a way back. */
export function createAppQueryClient(): QueryClient {
  const client = createQueryClient({
    onUnauthorized: () => client.setQueryData(getMeQueryOptions().queryKey, null),
  });
  return client;
}

/** `client` is given when the page starts from server-rendered HTML: it already holds the data that HTML shows. */
export function AppProvider({ client, children }: { client?: QueryClient; children: ReactNode }) {
  const [queryClient] = useState(() => client ?? createAppQueryClient());
  return (
    <QueryClientProvider client={queryClient}>
      <ToastProvider>{children}</ToastProvider>
    </QueryClientProvider>
  );
}
