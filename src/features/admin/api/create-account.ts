import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { accountsQueryOptions } from './get-accounts';

export interface CreateAccountInput {
  email: string;
  name: string;
  password: string;
  isAdmin: boolean;
}

export function createAccount(input: CreateAccountInput): Promise<unknown> {
  return api.post('/api/admin/accounts', input);
}

export function useCreateAccount() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createAccount,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: accountsQueryOptions().queryKey }),
  });
}
