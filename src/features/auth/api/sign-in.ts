import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { type MeResponse, meQueryOptions } from './get-me';

export interface SignInInput {
  email: string;
  password: string;
}

export function signIn(input: SignInInput): Promise<MeResponse> {
  return api.post<MeResponse>('/api/auth/sign-in', input, { allowUnauthenticated: true });
}

export function useSignIn() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    onSuccess: async (data) => {
      // A new person may now be signed in: forget everything cached for the last one.
      queryClient.clear();
      queryClient.setQueryData(meQueryOptions().queryKey, data);
    },
  });
}
