import { useMutation } from '@tanstack/react-query';
import type {
  MoreLikeResponsiveReq,
  MoreLikeResponsiveResponse,
} from '@shared/schemas/prioritised';
import { api } from '@/lib/api-client';

/** POST /api/matters/:matterId/prioritised/more-like-responsive (Rocchio feedback). */
export function moreLikeResponsive(matterId: number, body: MoreLikeResponsiveReq) {
  return api.post<MoreLikeResponsiveResponse>(
    `/api/matters/${matterId}/prioritised/more-like-responsive`,
    body,
  );
}

export function useMoreLikeResponsive(matterId: number) {
  return useMutation({
    mutationFn: (body: MoreLikeResponsiveReq) => moreLikeResponsive(matterId, body),
  });
}
