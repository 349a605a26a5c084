import { useMutation, useQuery } from '@tanstack/react-query';
import type { SignInResponse } from '../shared/schemas/auth';
import type { TokenInfo } from '../shared/schemas/invitations';
import { apiFetch } from './api';
import { queryKeys } from './queryKeys';
import { useSession } from './session';

/** Whose one-time link this is (invitation or password reset); 404 when it has expired, been used or is unknown. */
export function useLinkInfo(token: string) {
  return useQuery({
    queryKey: queryKeys.linkInfo(token),
    queryFn: () => apiFetch<TokenInfo>('/auth/link-info', { method: 'POST', body: { token } }),
    retry: false,
    staleTime: Infinity,
  });
}

/** Sets the password through a one-time link and signs in with the session the API returns. */
export function useSetPasswordFromLink(purpose: TokenInfo['purpose']) {
  const { adopt } = useSession();
  return useMutation({
    mutationFn: (input: { token: string; password: string }) =>
      apiFetch<SignInResponse>(purpose === 'invitation' ? '/auth/accept-invitation' : '/auth/password-reset/confirm', {
        method: 'POST',
        body: input,
      }),
    onSuccess: (res) => adopt(res),
  });
}

export function useRequestPasswordReset() {
  return useMutation({
    mutationFn: (email: string) => apiFetch<{ ok: true }>('/auth/password-reset', { method: 'POST', body: { email } }),
  });
}

/** Changes the password; the API ends every other session and returns a new token for this one. */
export function useChangePassword() {
  const { adopt } = useSession();
  return useMutation({
    mutationFn: (input: { currentPassword: string; newPassword: string }) =>
      apiFetch<SignInResponse>('/auth/password', { method: 'POST', body: input }),
    onSuccess: (res) => adopt(res),
  });
}
