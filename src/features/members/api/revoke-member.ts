import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { matterQueryOptions } from '@/features/matters/api/get-matter';
import { membersQueryOptions } from './get-members';

export function revokeMember(matterId: number, userId: string): Promise<void> {
  return api.delete<void>(`/api/matters/${matterId}/members/${encodeURIComponent(userId)}`);
}

export function useRevokeMember(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (userId: string) => revokeMember(matterId, userId),
    onSuccess: async () => {
      await queryClient.invalidateQueries({ queryKey: membersQueryOptions(matterId).queryKey });
      await queryClient.invalidateQueries({
        queryKey: matterQueryOptions(matterId).queryKey,
        exact: true,
      });
    },
  });
}
