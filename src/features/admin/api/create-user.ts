import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreateUserReq, CreateUserResponse } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { usersQueryOptions } from './get-users';

/** A new account: with a temporary password the admin hands over, or (none given) an e-mailed set-up link. */
export function createUser(input: CreateUserReq): Promise<CreateUserResponse> {
  return api.post<CreateUserResponse>('/api/admin/users', input);
}

export function useCreateUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createUser,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: usersQueryOptions().queryKey }),
  });
}
