import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Code, CodesResponse } from '@shared/schemas/codes';
import { api } from '@/lib/api-client';

export type { Code, CodesResponse } from '@shared/schemas/codes';

/** GET /api/matters/:matterId/codes: every code, archived ones included, in sortOrder. */
export function getCodes(matterId: number, signal?: AbortSignal): Promise<CodesResponse> {
  return api.get<CodesResponse>(`/api/matters/${matterId}/codes`, { signal });
}

export const codesQueryKey = (matterId: number) =>
  ['matters', 'detail', matterId, 'codes'] as const;

export function codesQueryOptions(matterId: number) {
  return queryOptions({
    queryKey: codesQueryKey(matterId),
    queryFn: ({ signal }) => getCodes(matterId, signal),
    staleTime: 30_000,
  });
}

export function useCodes(matterId: number) {
  return useQuery(codesQueryOptions(matterId));
}

/** Codes that may still be applied, in the code set's order. */
export function activeCodes(codes: readonly Code[]): Code[] {
  return codes
    .filter((code) => code.archivedAt === null)
    .sort((a, b) => a.sortOrder - b.sortOrder || a.id - b.id);
}
