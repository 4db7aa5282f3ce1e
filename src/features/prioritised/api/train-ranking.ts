import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { TrainResponse } from '@shared/schemas/prioritised';
import { api } from '@/lib/api-client';
import { prioritisedStatusKey } from './get-prioritised-status';

/** POST /api/matters/:matterId/prioritised/train (ranking.train). */
export function trainRanking(matterId: number): Promise<TrainResponse> {
  return api.post<TrainResponse>(`/api/matters/${matterId}/prioritised/train`);
}

export function useTrainRanking(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => trainRanking(matterId),
    onSettled: () => queryClient.invalidateQueries({ queryKey: prioritisedStatusKey(matterId) }),
  });
}
