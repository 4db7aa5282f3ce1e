import { queryOptions, useQuery } from '@tanstack/react-query';
import type { CustodiansResponse } from '@shared/schemas/documents';
import { api } from '@/lib/api-client';

export type { Custodian, CustodiansResponse } from '@shared/schemas/documents';

/** The matter's custodians with their document counts. */
export function getCustodians(matterId: number, signal?: AbortSignal): Promise<CustodiansResponse> {
  return api.get<CustodiansResponse>(`/api/matters/${matterId}/custodians`, { signal });
}

export const custodiansQueryKey = (matterId: number) =>
  ['matters', 'detail', matterId, 'custodians'] as const;

export function custodiansQueryOptions(matterId: number) {
  return queryOptions({
    queryKey: custodiansQueryKey(matterId),
    queryFn: ({ signal }) => getCustodians(matterId, signal),
  });
}

export function useCustodians(matterId: number) {
  return useQuery(custodiansQueryOptions(matterId));
}
