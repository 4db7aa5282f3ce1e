import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export interface ChangePasswordInput {
  currentPassword: string;
  newPassword: string;
}

export function changePassword(input: ChangePasswordInput): Promise<void> {
  return api.post<void>('/api/auth/password', input);
}

export function useChangePassword() {
  return useMutation({ mutationFn: changePassword });
}
