import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export interface CurrentUser {
  id: string;
  email: string;
  name: string;
  isAdmin: boolean;
}

export interface MeResponse {
  user: CurrentUser;
}

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
