import { useQueryClient } from '@tanstack/react-query';
import { useEffect, useRef } from 'react';
import type { IndexStateResponse } from '@shared/schemas/indexing';
import { Button, ErrorPanel, Notice, SkeletonRows, describeError } from '@/components/ui';
import { Can } from '@/lib/authorization';
import { formatDateTime } from '@/lib/format';
import { documentsQueryKey } from '@/features/documents/api/get-documents';
import { isJobActive } from '@/features/jobs/api/get-matter-jobs';
import { JobProgress } from '@/features/jobs';
import { useIndexState } from '../api/get-index-state';
import { useRebuildIndex } from '../api/rebuild-index';

const numberFormat = new Intl.NumberFormat();

/**
 * The state of the matter's concept index: how many documents are in the built space,
 * folded in since, waiting or failed; the serving version, when it was built and its k;
 * a live bar while a build or extraction runs; and, for leads, "Rebuild index".
 */
export function IndexStatusPanel({ matterId }: { matterId: number }) {
  const state = useIndexState(matterId);
  useRefreshDocumentsWhenSettled(matterId, state.data);
  return (
    <section
      aria-labelledby="index-status-heading"
      className="rounded-md border border-line bg-panel p-4"
      data-testid="index-status"
    >
      <div className="mb-3 flex items-baseline justify-between gap-2">
        <h2 id="index-status-heading" className="text-sm font-semibold">
          Concept index
        </h2>
        {state.data?.current ? (
          <span className="font-mono text-xs text-ink-muted" data-testid="index-version">
            v{state.data.current.version}
          </span>
        ) : null}
      </div>
      {state.isPending ? (
        <SkeletonRows rows={3} label="Loading the index state" />
      ) : state.isError ? (
        <ErrorPanel
          error={state.error}
          title="The index state could not be loaded"
          onRetry={() => void state.refetch()}
        />
      ) : (
        <IndexStatusBody matterId={matterId} data={state.data} />
      )}
    </section>
  );
}

function IndexStatusBody({ matterId, data }: { matterId: number; data: IndexStateResponse }) {
  const rebuild = useRebuildIndex(matterId);
  const { counts, current, building, lastFailed, activeJob } = data;
  const buildRunning =
    building != null || (activeJob?.kind === 'build-index' && isJobActive(activeJob));
  const spaceSize = counts.indexed + counts.foldedIn;
  const foldShare = spaceSize > 0 ? counts.foldedIn / spaceSize : 0;

  const tiles: { label: string; value: number; testId: string }[] = [
    { label: 'Indexed', value: counts.indexed, testId: 'index-count-indexed' },
    { label: 'Folded in', value: counts.foldedIn, testId: 'index-count-folded' },
    { label: 'Waiting', value: counts.waiting, testId: 'index-count-waiting' },
    { label: 'Failed', value: counts.failed, testId: 'index-count-failed' },
  ];

  return (
    <div className="space-y-3">
      <dl className="grid grid-cols-4 gap-2">
        {tiles.map((tile) => (
          <div key={tile.label} className="rounded border border-line bg-paper px-2 py-1.5">
            <dt className="text-[11px] font-medium tracking-wide text-ink-muted uppercase">
              {tile.label}
            </dt>
            <dd className="text-lg font-semibold tabular-nums" data-testid={tile.testId}>
              {numberFormat.format(tile.value)}
            </dd>
          </div>
        ))}
      </dl>

      {current ? (
        <dl className="grid grid-cols-[7rem_1fr] gap-y-0.5 text-[13px]">
          <dt className="text-ink-muted">Version</dt>
          <dd className="tabular-nums">{current.version}</dd>
          <dt className="text-ink-muted">Built</dt>
          <dd>{formatDateTime(current.completedAt ?? current.createdAt)}</dd>
          <dt className="text-ink-muted">Concepts (k)</dt>
          <dd className="tabular-nums" data-testid="index-k">
            {current.k}
            {current.requestedK != null && current.requestedK !== current.k ? (
              <span className="text-ink-muted"> (asked {current.requestedK})</span>
            ) : null}
          </dd>
          <dt className="text-ink-muted">Terms</dt>
          <dd className="tabular-nums">{numberFormat.format(current.nTerms)}</dd>
          <dt className="text-ink-muted">Weighting</dt>
          <dd>{current.weighting}</dd>
          {current.diagnostics.energy != null ? (
            <>
              <dt className="text-ink-muted">Energy kept</dt>
              <dd
                className="tabular-nums"
                title="Share of the squared Frobenius norm the rank-k space keeps (Eckart-Young)"
              >
                {(current.diagnostics.energy * 100).toFixed(1)}%
              </dd>
            </>
          ) : null}
          {foldShare > 0 ? (
            <>
              <dt className="text-ink-muted">Folded share</dt>
              <dd className="tabular-nums">
                {(foldShare * 100).toFixed(1)}%{' '}
                <span className="text-ink-muted">
                  (rebuilds by itself above {Math.round(data.rebuildFoldInShare * 100)}%)
                </span>
              </dd>
            </>
          ) : null}
        </dl>
      ) : (
        <p className="text-[13px] text-ink-muted">
          No index has been built yet. It is built once the first documents are extracted.
        </p>
      )}

      {activeJob && isJobActive(activeJob) ? <JobProgress job={activeJob} /> : null}

      {lastFailed ? (
        <Notice tone="warn" title={`Build of version ${lastFailed.version} failed`}>
          {lastFailed.error ?? 'The build stopped before it finished.'}{' '}
          {current ? `Version ${current.version} keeps serving searches.` : null}
        </Notice>
      ) : null}

      <Can permission="index.rebuild">
        <div className="flex items-center gap-3 border-t border-line pt-3">
          <Button
            size="sm"
            onClick={() => rebuild.mutate({})}
            busy={rebuild.isPending}
            disabled={buildRunning}
            data-testid="rebuild-index"
          >
            Rebuild index
          </Button>
          <span className="text-xs text-ink-muted">
            {buildRunning
              ? 'A build is running; the current version serves until it is done.'
              : 'Recomputes the concept space from every extracted document.'}
          </span>
        </div>
        {rebuild.isError ? (
          <Notice tone="danger" className="mt-2" title="The rebuild was not started">
            {describeError(rebuild.error)}
          </Notice>
        ) : null}
      </Can>
    </div>
  );
}

/**
 * When a build or an extraction finishes, every listed document's index state may have
 * changed (waiting to indexed or folded in): refetch the document queries once.
 */
function useRefreshDocumentsWhenSettled(matterId: number, data: IndexStateResponse | undefined) {
  const queryClient = useQueryClient();
  const wasActive = useRef(false);
  const active = Boolean(
    data && ((data.activeJob && isJobActive(data.activeJob)) || data.building != null),
  );
  useEffect(() => {
    if (wasActive.current && !active) {
      void queryClient.invalidateQueries({ queryKey: documentsQueryKey(matterId) });
    }
    wasActive.current = active;
  }, [active, matterId, queryClient]);
}
