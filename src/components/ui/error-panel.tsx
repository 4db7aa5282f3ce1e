import { isApiError } from '@/lib/api-client';
import { Button } from './button';

/** Describes a failed request in words a person can act on. */
export function describeError(error: unknown): string {
  if (isApiError(error)) return error.message;
  if (error instanceof Error && error.message) return error.message;
  return 'Something went wrong.';
}

/** Shown where a query failed: the API's message and a way to try again. */
export function ErrorPanel({
  error,
  title = 'This could not be loaded',
  onRetry,
}: {
  error: unknown;
  title?: string;
  onRetry?: () => void;
}) {
  const code = isApiError(error) ? error.code : undefined;
  return (
    <div
      role="alert"
      data-testid="error-panel"
      className="rounded-md border border-danger/35 bg-danger-soft px-4 py-3 text-sm"
    >
      <p className="font-semibold text-danger">{title}</p>
      <p className="mt-0.5 text-ink">{describeError(error)}</p>
      {code ? <p className="mt-0.5 font-mono text-xs text-ink-muted">{code}</p> : null}
      {onRetry ? (
        <Button size="sm" className="mt-2" onClick={onRetry}>
          Try again
        </Button>
      ) : null}
    </div>
  );
}
