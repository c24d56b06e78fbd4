import { useState, type ReactNode } from 'react';
import { QueryClientProvider } from '@tanstack/react-query';
import { ToastProvider } from '@/components/ui/toast';
import { createQueryClient } from '@/lib/query-client';
import { getMeQueryOptions } from '@/features/auth/api/get-me';

export function AppProvider({ children }: { children: ReactNode }) {
  const [queryClient] = useState(() => {
    // A 401 anywhere means the session is gone: forget the account, and the guards on protected
    // layouts send the visitor to sign-in with a way back.
    const client = createQueryClient({
      onUnauthorized: () => client.setQueryData(getMeQueryOptions().queryKey, null),
    });
    return client;
  });
  return (
    <QueryClientProvider client={queryClient}>
      <ToastProvider>{children}</ToastProvider>
    </QueryClientProvider>
  );
}
