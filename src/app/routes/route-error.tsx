import { isRouteErrorResponse, useRouteError } from 'react-router-dom';
import { ErrorPanel } from '@/components/ui';

/** Shown when a loader or a page throws: the message and a reload, never a blank screen. */
export function RouteError() {
  const error = useRouteError();
  const shown = isRouteErrorResponse(error)
    ? new Error(`${error.status} ${error.statusText}`)
    : error;
  return (
    <div className="mx-auto max-w-3xl px-4 py-10">
      <ErrorPanel error={shown} title="This page failed" onRetry={() => window.location.reload()} />
    </div>
  );
}
