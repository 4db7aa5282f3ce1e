import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { HoldResponse } from '@shared/schemas/holds';
import { api } from '@/lib/api-client';
import { holdsQueryKey } from './get-holds';

/** Releases a legal hold; the reason is kept with it and in the activity log. */
export function releaseHold(
  matterId: number,
  holdId: number,
  reason: string,
): Promise<HoldResponse> {
  return api.post<HoldResponse>(`/api/matters/${matterId}/holds/${holdId}/release`, { reason });
}

export function useReleaseHold(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ holdId, reason }: { holdId: number; reason: string }) =>
      releaseHold(matterId, holdId, reason),
    onSettled: () => queryClient.invalidateQueries({ queryKey: holdsQueryKey(matterId) }),
  });
}
