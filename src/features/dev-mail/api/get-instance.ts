import { queryOptions, useQuery } from '@tanstack/react-query';
import type { InstanceInfoResponse } from '@shared/schemas/dev';
import { api } from '@/lib/api-client';

export type { InstanceInfoResponse } from '@shared/schemas/dev';

/** How this installation runs (demo mode, who may read the demo mailbox); public. */
export function getInstance(signal?: AbortSignal): Promise<InstanceInfoResponse> {
  return api.get<InstanceInfoResponse>('/api/instance', { signal, allowUnauthenticated: true });
}

export function instanceQueryOptions() {
  return queryOptions({
    queryKey: ['instance'],
    queryFn: ({ signal }) => getInstance(signal),
    // Fixed for the life of the server process.
    staleTime: Infinity,
  });
}

export function useInstance() {
  return useQuery(instanceQueryOptions());
}
