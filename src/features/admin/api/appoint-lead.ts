import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { AppointLeadReq, AppointLeadResponse } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { adminMattersQueryOptions } from './get-admin-matters';

export interface AppointLeadInput extends AppointLeadReq {
  matterId: number;
}

export function appointLead({ matterId, lead }: AppointLeadInput): Promise<AppointLeadResponse> {
  return api.put<AppointLeadResponse>(`/api/admin/matters/${matterId}/lead`, { lead });
}

export function useAppointLead() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: appointLead,
    onSuccess: () =>
      queryClient.invalidateQueries({ queryKey: adminMattersQueryOptions().queryKey }),
  });
}
