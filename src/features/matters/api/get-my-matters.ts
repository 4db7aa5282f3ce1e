import { queryOptions, useQuery } from '@tanstack/react-query';
import type { MatterRole } from '../../../../shared/roles';
import { api } from '../../../lib/api-client';

export interface MatterSummary {
  id: number;
  name: string;
  description: string;
  controlPrefix: string;
  role: MatterRole;
  createdAt: string;
}

export interface MyMattersResponse {
  matters: MatterSummary[];
}

export function getMyMatters(signal?: AbortSignal): Promise<MyMattersResponse> {
  return api.get<MyMattersResponse>('/api/matters', { signal });
}

export function myMattersQueryOptions() {
  return queryOptions({
    queryKey: ['matters', 'mine'],
    queryFn: ({ signal }) => getMyMatters(signal),
  });
}

export function useMyMatters() {
  return useQuery(myMattersQueryOptions());
}
