import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { membersQueryOptions } from './get-members';

export interface RevokeMemberInput {
  userId: string;
}

export function revokeMember(matterId: number, input: RevokeMemberInput): Promise<unknown> {
  return api.delete(`/api/matters/${matterId}/members`, input);
}

export function useRevokeMember(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: RevokeMemberInput) => revokeMember(matterId, input),
    onSuccess: () =>
      queryClient.invalidateQueries({ queryKey: membersQueryOptions(matterId).queryKey }),
  });
}
