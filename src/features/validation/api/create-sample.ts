import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreateSampleReq, CreateSampleResponse } from '@shared/schemas/validation';
import { api } from '@/lib/api-client';
import { samplesKey } from './get-samples';

/** POST /api/matters/:matterId/validation/samples (validation.run). */
export function createSample(matterId: number, body: CreateSampleReq) {
  return api.post<CreateSampleResponse>(`/api/matters/${matterId}/validation/samples`, body);
}

export function useCreateSample(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateSampleReq) => createSample(matterId, body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: samplesKey(matterId) }),
  });
}
