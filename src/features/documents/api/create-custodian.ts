import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreateCustodianReq, CreateCustodianResponse } from '@shared/schemas/documents';
import { api } from '@/lib/api-client';
import { custodiansQueryKey } from './get-custodians';

/** Adds a custodian (the person or source the documents were collected from). */
export function createCustodian(
  matterId: number,
  input: CreateCustodianReq,
): Promise<CreateCustodianResponse> {
  return api.post<CreateCustodianResponse>(`/api/matters/${matterId}/custodians`, input);
}

export function useCreateCustodian(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: CreateCustodianReq) => createCustodian(matterId, input),
    onSuccess: async () => {
      await queryClient.invalidateQueries({ queryKey: custodiansQueryKey(matterId) });
    },
  });
}
