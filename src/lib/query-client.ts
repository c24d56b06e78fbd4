import { MutationCache, QueryCache, QueryClient } from '@tanstack/react-query';
import { ApiError } from './api-client';

export type QueryClientHooks = {
  /** Called when any query or mutation answers 401 for a reason other than wrong credentials. */
  onUnauthorized?: (error: ApiError) => void;
};

// Wrong credentials on the sign-in form are an answer for the form, not a lost session.
const FORM_401_CODES = new Set(['auth.invalid_credentials']);

export function createQueryClient(hooks: QueryClientHooks = {}): QueryClient {
  const handle = (error: unknown) => {
    if (error instanceof ApiError && error.status === 401 && !FORM_401_CODES.has(error.code)) {
      hooks.onUnauthorized?.(error);
    }
  };
  return new QueryClient({
    queryCache: new QueryCache({ onError: handle }),
    mutationCache: new MutationCache({ onError: handle }),
    defaultOptions: {
      queries: {
        staleTime: 30_000,
        // Client errors will not change on retry; network and server errors may.
        retry: (failureCount, error) => (error instanceof ApiError && error.status >= 400 && error.status < 500 ? false : failureCount < 2),
      },
      mutations: { retry: false },
    },
  });
}
