import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { adminMattersQueryOptions } from './get-admin-matters';

export interface CreateMatterInput {
  name: string;
  description: string;
  controlPrefix: string;
  leadEmail?: string;
}

export function createMatter(input: CreateMatterInput): Promise<unknown> {
  return api.post('/api/matters', input);
}

export function useCreateMatter() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createMatter,
    onSuccess: () =>
      queryClient.invalidateQueries({ queryKey: adminMattersQueryOptions().queryKey }),
  });
}
