import { queryOptions, useQuery } from '@tanstack/react-query';
import type { AccountSetupPreviewResponse } from '@shared/schemas/auth';
import { api } from '@/lib/api-client';

export type { AccountSetupPreviewResponse } from '@shared/schemas/auth';

/** Whose account a set-up link is for (public: the token is the credential). */
export function getAccountSetup(
  token: string,
  signal?: AbortSignal,
): Promise<AccountSetupPreviewResponse> {
  return api.get<AccountSetupPreviewResponse>(`/api/account-setup/${encodeURIComponent(token)}`, {
    signal,
    allowUnauthenticated: true,
  });
}

export function accountSetupQueryOptions(token: string) {
  return queryOptions({
    queryKey: ['account-setup', token],
    queryFn: ({ signal }) => getAccountSetup(token, signal),
    // A link turns used or expired on the server; never show a stale "still valid".
    staleTime: 0,
  });
}

export function useAccountSetup(token: string) {
  return useQuery(accountSetupQueryOptions(token));
}
