import { useMutation } from '@tanstack/react-query';
import type { TermReportReq, TermReportResponse } from '@shared/schemas/search-term-report';
import { api } from '@/lib/api-client';

/** POST /api/matters/:matterId/search-term-report: hits per term. Audited. */
export function runTermReport(matterId: number, request: TermReportReq) {
  return api.post<TermReportResponse>(`/api/matters/${matterId}/search-term-report`, request);
}

/** A report runs when the person asks (each run is audited), hence a mutation. */
export function useTermReport(matterId: number) {
  return useMutation({ mutationFn: (request: TermReportReq) => runTermReport(matterId, request) });
}
