import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { CreateMatterResponse, createMatterSchema } from '@shared/schemas/matters';
import { api } from '@/lib/api-client';
import { usersQueryOptions } from './get-users';
import { adminMattersQueryOptions } from './get-admin-matters';

export type CreateMatterInput = z.input<typeof createMatterSchema>;

/** A matter and its first lead (an account's e-mail or id). */
export function createMatter(input: CreateMatterInput): Promise<CreateMatterResponse> {
  return api.post<CreateMatterResponse>('/api/matters', input);
}

export function useCreateMatter() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createMatter,
    onSuccess: async () => {
      await queryClient.invalidateQueries({ queryKey: adminMattersQueryOptions().queryKey });
      await queryClient.invalidateQueries({ queryKey: usersQueryOptions().queryKey });
    },
  });
}
