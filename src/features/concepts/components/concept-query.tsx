import type { UseQueryResult } from '@tanstack/react-query';
import type { ReactNode } from 'react';
import { EmptyState, QueryBoundary, describeError } from '@/components/ui';
import { isApiError } from '@/lib/api-client';

/** The concept routes answer 409 while the matter has no serving index version. */
export function isNoIndexError(error: unknown): boolean {
  return isApiError(error) && error.status === 409;
}

/**
 * QueryBoundary for a concept-space query: loading skeleton, error with retry, and a
 * calm empty state (with the server's words) when there is no index to show yet.
 */
export function ConceptQuery<T>({
  query,
  children,
  loading,
  errorTitle,
}: {
  query: UseQueryResult<T>;
  children: (data: T) => ReactNode;
  loading?: ReactNode;
  errorTitle?: string;
}) {
  if (query.isError && isNoIndexError(query.error)) {
    return (
      <EmptyState title="No concept index yet">
        <span data-testid="no-index">{describeError(query.error)}</span>
      </EmptyState>
    );
  }
  return (
    <QueryBoundary query={query} loading={loading} errorTitle={errorTitle}>
      {children}
    </QueryBoundary>
  );
}
