import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { LoginInput, MeResponse } from '../../../../shared/auth/user.js';
import { post, setCsrfToken } from '../../../lib/api-client.js';
import { queryKeys } from '../../../lib/query-keys.js';

export function useSignIn() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: LoginInput) => post<MeResponse>('/api/auth/login', input),
    onSuccess: (me) => {
      setCsrfToken(me.csrfToken);
      qc.clear();
      qc.setQueryData(queryKeys.me, me);
    },
  });
}

export function useSignOut() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => post('/api/auth/logout'),
    onSettled: () => {
      setCsrfToken('');
      qc.clear();
      qc.setQueryData(queryKeys.me, null);
    },
  });
}

export function useSetPassword(kind: 'reset' | 'invite') {
  return useMutation({
    mutationFn: (input: { token: string; password: string }) =>
      post<{ ok: boolean; email: string }>(kind === 'reset' ? '/api/auth/password-reset/confirm' : '/api/auth/invitation/accept', input),
  });
}

export function useRequestReset() {
  return useMutation({ mutationFn: (email: string) => post<{ message: string }>('/api/auth/password-reset', { email }) });
}
