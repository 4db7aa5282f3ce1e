import { isApiError } from './api-client';

/**
 * TanStack Query's retry rule for Quarry: a 4xx cannot succeed on a retry (the request
 * is wrong, refused or unauthenticated), so only network failures and 5xx are retried,
 * twice.
 */
export function shouldRetry(failureCount: number, error: unknown): boolean {
  if (isApiError(error) && error.isClientError) return false;
  return failureCount < 2;
}
