import { queryOptions, useQuery } from '@tanstack/react-query';
import type { DevMailResponse } from '@shared/schemas/dev';
import { api } from '@/lib/api-client';

export type { DevMailMessage, DevMailResponse } from '@shared/schemas/dev';

/** The fake SMTP server's mailbox, newest first; the endpoint is a 404 outside demo/dev mode. */
export function getDevMail(signal?: AbortSignal): Promise<DevMailResponse> {
  return api.get<DevMailResponse>('/api/dev/mail', { signal, allowUnauthenticated: true });
}

export function devMailQueryOptions() {
  return queryOptions({
    queryKey: ['dev', 'mail'],
    queryFn: ({ signal }) => getDevMail(signal),
    staleTime: 0,
  });
}

export function useDevMail() {
  return useQuery(devMailQueryOptions());
}
