import { queryOptions, useQuery } from '@tanstack/react-query';
import type { MeResponse } from '@shared/schemas/auth';
import { api } from '@/lib/api-client';

export type { ApiUser, MeResponse } from '@shared/schemas/auth';

export function getMe(signal?: AbortSignal): Promise<MeResponse> {
  return api.get<MeResponse>('/api/auth/me', { signal, allowUnauthenticated: true });
}

export function meQueryOptions() {
  return queryOptions({
    queryKey: ['auth', 'me'],
    queryFn: ({ signal }) => getMe(signal),
    staleTime: 60_000,
  });
}

export function useMe() {
  return useQuery(meQueryOptions());
}
