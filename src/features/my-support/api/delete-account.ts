import { useMutation } from '@tanstack/react-query';
import { api } from '@/lib/api-client';

export const exportDataUrl = '/api/my-support/export';

export function deleteAccount(confirmEmail: string) {
  return api.delete<void>('/api/my-support/account', { confirmEmail }, { rotatesSession: true });
}

export function useDeleteAccount() {
  return useMutation({ mutationFn: deleteAccount });
}
