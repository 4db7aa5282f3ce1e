import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { MeResponse } from '@shared/schemas/auth';
import type { SignInReq } from '@shared/schemas/auth';
import { api } from '@/lib/api-client';
import { meQueryOptions } from './get-me';

export function signIn(input: SignInReq): Promise<MeResponse> {
  return api.post<MeResponse>('/api/auth/sign-in', input, { allowUnauthenticated: true });
}

export function useSignIn() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    onSuccess: (data) => {
      // Another person may now be signed in: forget everything cached for the last one.
      queryClient.clear();
      queryClient.setQueryData(meQueryOptions().queryKey, data);
    },
  });
}
