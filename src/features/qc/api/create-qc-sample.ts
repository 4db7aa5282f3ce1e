import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreateQcSampleReq, QcSampleResponse } from '@shared/schemas/qc';
import { api } from '@/lib/api-client';
import { batchesQueryKey } from '@/features/batches/api/keys';
import { qcQueryKey } from './keys';

/** POST /api/matters/:matterId/qc/samples: draw a QC sample into a QC batch. */
export function createQcSample(matterId: number, body: CreateQcSampleReq) {
  return api.post<QcSampleResponse>(`/api/matters/${matterId}/qc/samples`, body);
}

export function useCreateQcSample(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateQcSampleReq) => createQcSample(matterId, body),
    onSuccess: async () => {
      await queryClient.invalidateQueries({ queryKey: qcQueryKey(matterId) });
      await queryClient.invalidateQueries({ queryKey: batchesQueryKey(matterId) });
    },
  });
}
