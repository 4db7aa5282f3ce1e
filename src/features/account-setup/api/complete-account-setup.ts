import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CompleteAccountSetupReq, MeResponse } from '@shared/schemas/auth';
import { api } from '@/lib/api-client';
import { meQueryOptions } from '@/features/auth/api/get-me';

/** Chooses the account's password (once); the server then signs this browser in as it. */
export function completeAccountSetup(
  token: string,
  input: CompleteAccountSetupReq,
): Promise<MeResponse> {
  return api.post<MeResponse>(`/api/account-setup/${encodeURIComponent(token)}`, input, {
    allowUnauthenticated: true,
  });
}

export function useCompleteAccountSetup(token: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: CompleteAccountSetupReq) => completeAccountSetup(token, input),
    onSuccess: (me) => {
      // The session changed hands: nothing cached for a previous person may show.
      queryClient.clear();
      queryClient.setQueryData(meQueryOptions().queryKey, me);
    },
  });
}
