import type { UseQueryResult } from '@tanstack/react-query';
import type { ReactNode } from 'react';
import { ErrorPanel } from './error-panel';
import { SkeletonRows } from './spinner';

/**
 * Renders a query's loading skeleton, its error panel with a retry, or its data.
 * Every screen uses it so no query is left without both states.
 */
export function QueryBoundary<T>({
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
  if (query.isPending) return <>{loading ?? <SkeletonRows />}</>;
  if (query.isError)
    return (
      <ErrorPanel error={query.error} title={errorTitle} onRetry={() => void query.refetch()} />
    );
  return <>{children(query.data)}</>;
}
