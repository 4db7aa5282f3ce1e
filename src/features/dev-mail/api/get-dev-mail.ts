import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export interface DevMailMessage {
  id: string;
  from: string;
  to: string[];
  subject: string;
  receivedAt: string;
  text: string;
  html?: string | null;
}

export interface DevMailResponse {
  messages: DevMailMessage[];
}

/** The fake SMTP server's mailbox; the endpoint answers 404 outside demo/dev mode. */
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
