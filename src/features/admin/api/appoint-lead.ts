import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { adminMattersQueryOptions } from './get-admin-matters';

export interface AppointLeadInput {
  matterId: number;
  email: string;
}

export function appointLead({ matterId, email }: AppointLeadInput): Promise<unknown> {
  return api.post(`/api/admin/matters/${matterId}/lead`, { email });
}

export function useAppointLead() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: appointLead,
    onSuccess: () =>
      queryClient.invalidateQueries({ queryKey: adminMattersQueryOptions().queryKey }),
  });
}
