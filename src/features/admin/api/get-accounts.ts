import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export interface Account {
  id: string;
  email: string;
  name: string;
  isAdmin: boolean;
  createdAt: string;
  disabledAt: string | null;
}

export interface AccountsResponse {
  accounts: Account[];
}

export function getAccounts(signal?: AbortSignal): Promise<AccountsResponse> {
  return api.get<AccountsResponse>('/api/admin/accounts', { signal });
}

export function accountsQueryOptions() {
  return queryOptions({
    queryKey: ['admin', 'accounts'],
    queryFn: ({ signal }) => getAccounts(signal),
  });
}

export function useAccounts() {
  return useQuery(accountsQueryOptions());
}
