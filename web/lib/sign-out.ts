import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api, setCsrfToken } from './api-client';

export const signOut = () => api<void>('/api/v1/session', { method: 'DELETE' });

export function useSignOut() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: signOut,
    onSuccess: () => {
      setCsrfToken(null);
      // Nothing cached for the signed-in person may outlive the session.
      client.clear();
    },
  });
}
