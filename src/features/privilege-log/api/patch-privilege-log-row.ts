import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { PrivilegeLogPatchReq, PrivilegeLogRow } from '@shared/schemas/privilege-log';
import { api } from '@/lib/api-client';
import { privilegeLogQueryKey } from './get-privilege-log';

/** PATCH /api/matters/:matterId/privilege-log/:docId: edit a row in place (audited). */
export function patchPrivilegeLogRow(matterId: number, docId: number, body: PrivilegeLogPatchReq) {
  return api.patch<{ row: PrivilegeLogRow }>(
    `/api/matters/${matterId}/privilege-log/${docId}`,
    body,
  );
}

export function usePatchPrivilegeLogRow(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (vars: { docId: number } & PrivilegeLogPatchReq) => {
      const { docId, ...body } = vars;
      return patchPrivilegeLogRow(matterId, docId, body);
    },
    onSettled: () => queryClient.invalidateQueries({ queryKey: privilegeLogQueryKey(matterId) }),
  });
}
