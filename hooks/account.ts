import { useMutation, useQuery } from '@tanstack/react-query';
import type { TokenInfo } from '../shared/schemas/invitations';
import { contract } from '../shared/api';
import { callApi } from './api';
import { queryKeys } from './queryKeys';
import { useSession } from './session';

/** Whose one-time link this is (invitation or password reset); 404 when it has expired, been used or is unknown. */
export function useLinkInfo(token: string) {
  return useQuery({
    queryKey: queryKeys.linkInfo(token),
    queryFn: () => callApi(contract.accountLinks.linkInfo, { body: { token } }),
    retry: false,
    staleTime: Infinity,
  });
}

/** Sets the password through a one-time link and signs in with the session the API returns. */
export function useSetPasswordFromLink(purpose: TokenInfo['purpose']) {
  const { adopt } = useSession();
  return useMutation({
    mutationFn: (input: { token: string; password: string }) =>
      purpose === 'invitation'
        ? callApi(contract.accountLinks.acceptInvitation, { body: input })
        : callApi(contract.accountLinks.confirmPasswordReset, { body: input }),
    onSuccess: (res) => adopt(res),
  });
}

export function useRequestPasswordReset() {
  return useMutation({
    mutationFn: (email: string) => callApi(contract.accountLinks.requestPasswordReset, { body: { email } }),
  });
}

/** Changes the password; the API ends every other session and returns a new token for this one. */
export function useChangePassword() {
  const { adopt } = useSession();
  return useMutation({
    mutationFn: (input: { currentPassword: string; newPassword: string }) =>
      callApi(contract.accountLinks.changePassword, { body: input }),
    onSuccess: (res) => adopt(res),
  });
}
