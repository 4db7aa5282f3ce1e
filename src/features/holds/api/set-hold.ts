import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { HoldResponse, SetHoldReq } from '@shared/schemas/holds';
import { api } from '@/lib/api-client';
import { holdsQueryKey } from './get-holds';

/** Sets a legal hold on the whole matter (custodianId null) or one custodian. */
export function setHold(matterId: number, body: SetHoldReq): Promise<HoldResponse> {
  return api.post<HoldResponse>(`/api/matters/${matterId}/holds`, body);
}

export function useSetHold(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: SetHoldReq) => setHold(matterId, body),
    onSettled: () => queryClient.invalidateQueries({ queryKey: holdsQueryKey(matterId) }),
  });
}
