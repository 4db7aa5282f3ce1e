import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ChangePasswordReq, MeResponse } from '@shared/schemas/auth';
import { api } from '@/lib/api-client';
import { meQueryOptions } from './get-me';

/** Ends every session of the account; the server starts a fresh one for this browser. */
export function changePassword(input: ChangePasswordReq): Promise<MeResponse> {
  return api.post<MeResponse>('/api/auth/password', input);
}

export function useChangePassword() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: changePassword,
    onSuccess: (data) => queryClient.setQueryData(meQueryOptions().queryKey, data),
  });
}
