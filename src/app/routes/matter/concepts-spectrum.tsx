import type { QueryClient } from '@tanstack/react-query';
import { type ReactNode, useState } from 'react';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { EmptyState, QueryBoundary, SkeletonRows } from '@/components/ui';
import { spectrumQueryOptions, useSpectrum } from '@/features/concepts/api/get-spectrum';
import { RebuildForm } from '@/features/concepts/components/rebuild-form';
import { SpectrumChart } from '@/features/concepts/components/spectrum-chart';
import { VersionComparison } from '@/features/concepts/components/version-comparison';
import { formatFigure, formatShare, conditionNumberOf } from '@/features/concepts/format';
import { useBuildTimes } from '@/features/concepts/hooks/use-build-times';
import { indexStateQueryOptions, useIndexState } from '@/features/indexing/api/get-index-state';
import { Can, useMatterPermission } from '@/lib/authorization';
import { ConceptViewForbidden } from './concepts';
import { parseMatterId, useMatterId } from './layout';

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ params }: LoaderFunctionArgs) => {
    const matterId = parseMatterId(params.matterId);
    if (Number.isNaN(matterId)) return null;
    void queryClient.prefetchQuery(spectrumQueryOptions(matterId));
    void queryClient.prefetchQuery(indexStateQueryOptions(matterId));
    return null;
  };

/** Spectrum: the singular values, the energy kept, and (for the lead) another k to try. */
export function ConceptsSpectrumRoute() {
  const matterId = useMatterId();
  if (!useMatterPermission('concepts.view')) return <ConceptViewForbidden />;
  return <SpectrumPage matterId={matterId} />;
}

function SpectrumPage({ matterId }: { matterId: number }) {
  const spectrum = useSpectrum(matterId);
  const state = useIndexState(matterId);
  const buildMsOf = useBuildTimes(state.data);
  const [proposedK, setProposedK] = useState<number | null>(null);

  return (
    <div data-testid="concepts-spectrum">
      <QueryBoundary
        query={spectrum}
        errorTitle="The spectrum could not be loaded"
        loading={<SkeletonRows rows={8} label="Loading the spectrum" />}
      >
        {({ current, previous }) =>
          current == null ? (
            <EmptyState title="No concept index yet">
              The spectrum appears once the first index has been built from the matter&apos;s
              extracted documents.
            </EmptyState>
          ) : (
            <div className="grid gap-5 xl:grid-cols-[minmax(0,1fr)_26rem]">
              <div className="min-w-0 space-y-4">
                <dl className="grid grid-cols-2 gap-2 sm:grid-cols-4" aria-label="Serving version">
                  <Figure label="Concepts (k)" testId="spectrum-k">
                    {current.k}
                  </Figure>
                  <Figure label="Energy kept" testId="spectrum-energy">
                    {formatShare(current.energyKept)}
                  </Figure>
                  <Figure label="σ₁ = ‖A‖₂" testId="spectrum-sigma1">
                    {formatFigure(current.singularValues[0])}
                  </Figure>
                  <Figure label="Condition number σ₁/σₖ" testId="spectrum-condition">
                    {formatFigure(conditionNumberOf(current.singularValues))}
                  </Figure>
                </dl>
                <div className="rounded-md border border-line bg-panel p-4">
                  <SpectrumChart current={current} previous={previous} proposedK={proposedK} />
                </div>
                <VersionComparison current={current} previous={previous} buildMsOf={buildMsOf} />
              </div>
              <div className="min-w-0 space-y-4">
                <Can permission="index.rebuild">
                  <RebuildForm matterId={matterId} current={current} onProposedK={setProposedK} />
                </Can>
                <p className="text-xs text-ink-muted">
                  Energy kept is the share of the weighted term-document matrix&apos;s squared
                  Frobenius norm that the k leading dimensions hold; by the Eckart-Young theorem no
                  rank-k matrix keeps more. A larger condition number means the last dimensions
                  carry little weight next to the first.
                </p>
              </div>
            </div>
          )
        }
      </QueryBoundary>
    </div>
  );
}

function Figure({
  label,
  testId,
  children,
}: {
  label: string;
  testId: string;
  children: ReactNode;
}) {
  return (
    <div className="rounded-md border border-line bg-panel px-3 py-2">
      <dt className="text-xs font-medium text-ink-muted">{label}</dt>
      <dd className="mt-0.5 text-lg font-semibold tabular-nums" data-testid={testId}>
        {children}
      </dd>
    </div>
  );
}
