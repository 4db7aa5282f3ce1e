import { queryOptions, useQuery } from '@tanstack/react-query';
import type { MatterRole } from '../../../../shared/roles';
import { api } from '../../../lib/api-client';

export interface MatterDetail {
  id: number;
  name: string;
  description: string;
  controlPrefix: string;
  role: MatterRole;
  createdAt: string;
}

export interface MatterResponse {
  matter: MatterDetail;
}

export function getMatter(matterId: number, signal?: AbortSignal): Promise<MatterResponse> {
  return api.get<MatterResponse>(`/api/matters/${matterId}`, { signal });
}

export function matterQueryOptions(matterId: number) {
  return queryOptions({
    queryKey: ['matters', 'detail', matterId],
    queryFn: ({ signal }) => getMatter(matterId, signal),
  });
}

export function useMatter(matterId: number) {
  return useQuery(matterQueryOptions(matterId));
}
