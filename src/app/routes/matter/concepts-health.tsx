import type { QueryClient } from '@tanstack/react-query';
import type { ReactNode } from 'react';
import { Link, type LoaderFunctionArgs } from 'react-router-dom';
import type { HealthResponse } from '@shared/schemas/concepts';
import { Button, Notice, SkeletonRows, describeError } from '@/components/ui';
import {
  conceptHealthQueryOptions,
  useConceptHealth,
} from '@/features/concepts/api/get-concept-health';
import { formatCount, formatFigure, formatShare } from '@/features/concepts/format';
import { useRebuildIndex } from '@/features/indexing/api/rebuild-index';
import { Can, useMatterPermission } from '@/lib/authorization';
import { ConceptQuery } from '@/features/concepts/components/concept-query';
import { ConceptViewForbidden } from './concepts';
import { parseMatterId, useMatterId } from './layout';

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ params }: LoaderFunctionArgs) => {
    const matterId = parseMatterId(params.matterId);
    if (Number.isNaN(matterId)) return null;
    void queryClient.prefetchQuery(conceptHealthQueryOptions(matterId));
    return null;
  };

/** Index health: the serving version's figures in plain words, and when to rebuild. */
export function ConceptsHealthRoute() {
  const matterId = useMatterId();
  if (!useMatterPermission('concepts.view')) return <ConceptViewForbidden />;
  return <HealthPage matterId={matterId} />;
}

function HealthPage({ matterId }: { matterId: number }) {
  const health = useConceptHealth(matterId);
  return (
    <div data-testid="concepts-health">
      <ConceptQuery
        query={health}
        errorTitle="The index health could not be loaded"
        loading={<SkeletonRows rows={10} label="Loading the index health" />}
      >
        {(data) => <HealthBody matterId={matterId} data={data} />}
      </ConceptQuery>
    </div>
  );
}

function HealthBody({ matterId, data }: { matterId: number; data: HealthResponse }) {
  const rebuild = useRebuildIndex(matterId);
  const noise = data.messages.filter((m) => !m.code.startsWith('rebuild-'));
  const reasons = data.messages.filter((m) => m.code.startsWith('rebuild-'));

  return (
    <div className="space-y-4">
      {data.rebuildRecommended ? (
        <Notice
          tone="warn"
          title="A rebuild is recommended"
          action={
            <Can permission="index.rebuild">
              <Button
                size="sm"
                variant="primary"
                busy={rebuild.isPending}
                disabled={rebuild.isSuccess}
                onClick={() => rebuild.mutate({})}
                data-testid="health-rebuild"
              >
                {rebuild.isSuccess ? 'Rebuild queued' : 'Rebuild now'}
              </Button>
            </Can>
          }
        >
          <ul className="list-disc pl-5" data-testid="health-reasons">
            {reasons.length ? (
              reasons.map((m) => <li key={m.code}>{m.message}</li>)
            ) : (
              <li>The folded-in documents have moved the matter away from the built space.</li>
            )}
          </ul>
          {rebuild.isError ? (
            <p className="mt-1 font-medium text-danger">{describeError(rebuild.error)}</p>
          ) : null}
        </Notice>
      ) : (
        <Notice tone="ok" title="No rebuild needed">
          Folded-in documents and their drift are below the thresholds (drift{' '}
          {formatShare(data.thresholds.drift, 0)}, folded-in share{' '}
          {formatShare(data.thresholds.foldedShare, 0)}).
        </Notice>
      )}
      {noise.map((m) => (
        <Notice
          key={m.code}
          tone="warn"
          title={m.code === 'noise-dimensions' ? 'The last dimensions are noise' : 'Warning'}
        >
          {m.message}
          {m.code === 'noise-dimensions' ? (
            <>
              {' '}
              <Link className="font-medium underline" to={`/matters/${matterId}/concepts/spectrum`}>
                Try a smaller k on the spectrum
              </Link>
              .
            </>
          ) : null}
        </Notice>
      ))}

      <div className="grid gap-4 lg:grid-cols-2">
        <FigureGroup title="Size">
          <HealthFigure
            label="Documents indexed"
            value={formatCount(data.documents)}
            testId="health-documents"
            words={`${formatCount(data.builtDocuments)} were in the build; ${formatCount(data.foldedIn)} were folded in since.`}
          />
          <HealthFigure
            label="Terms indexed"
            value={formatCount(data.terms)}
            testId="health-terms"
            words="Distinct words (after stemming and stop-word removal) the space knows."
          />
          <HealthFigure
            label="Sparsity"
            value={formatShare(data.sparsity, 2)}
            testId="health-sparsity"
            words={`Share of the term-by-document table that is empty: ${formatCount(data.nnz)} non-zero entries in all. Text matrices are nearly all empty; that is normal.`}
          />
        </FigureGroup>
        <FigureGroup title={`The concept space (k = ${data.k})`}>
          <HealthFigure
            label="σ₁ (matrix 2-norm)"
            value={formatFigure(data.sigma1)}
            testId="health-sigma1"
            words="The largest singular value, which equals the matrix's 2-norm ‖A‖₂: the most any one direction is stretched."
          />
          <HealthFigure
            label="Condition number σ₁/σₖ"
            value={formatFigure(data.conditionNumber)}
            testId="health-condition"
            words={`σₖ = ${formatFigure(data.sigmaK)}. The larger this ratio, the less the last kept dimension carries next to the first${data.conditionNumber > data.thresholds.conditionNumber ? `; above ${formatFigure(data.thresholds.conditionNumber)} the last dimensions are mostly noise` : ''}.`}
          />
          <HealthFigure
            label="Energy kept"
            value={formatShare(data.energyKept)}
            testId="health-energy"
            words="Share of the weighted matrix's squared Frobenius norm the k dimensions hold; no rank-k space holds more (Eckart-Young)."
          />
          <HealthFigure
            label="Orthogonality error of U, V"
            value={`${formatFigure(data.orthogonalityU)} · ${formatFigure(data.orthogonalityV)}`}
            testId="health-orthogonality"
            words="Largest entry of UᵀU − I and of VᵀV − I. Near machine precision (below about 10⁻⁶) means the computed concept axes are truly independent."
          />
          {data.noiseDimensions > 0 ? (
            <HealthFigure
              label="Noise dimensions"
              value={formatCount(data.noiseDimensions)}
              testId="health-noise"
              words="Dimensions whose singular value is below the noise floor: they add little but noise to the searches."
            />
          ) : null}
        </FigureGroup>
        <FigureGroup title="Since the build">
          <HealthFigure
            label="Folded in"
            value={formatShare(data.foldedShare)}
            testId="health-folded"
            words={`${formatCount(data.foldedIn)} of ${formatCount(data.documents)} documents were added by folding in (projected onto the existing axes) rather than by the build.`}
          >
            <ThresholdBar
              value={data.foldedShare}
              threshold={data.thresholds.foldedShare}
              label="Folded-in share"
            />
          </HealthFigure>
          <HealthFigure
            label="Drift"
            value={data.drift == null ? 'none folded in' : formatShare(data.drift)}
            testId="health-drift"
            words={
              data.drift == null
                ? 'No document has been folded in since the build, so nothing can have drifted.'
                : `On average ${formatShare(data.drift)} of a folded-in document's weight lies outside the current space (1 − ‖Uₖᵀd‖²/‖d‖²; the worst document ${formatShare(data.driftMax)}).`
            }
          >
            {data.drift != null ? (
              <ThresholdBar value={data.drift} threshold={data.thresholds.drift} label="Drift" />
            ) : null}
          </HealthFigure>
        </FigureGroup>
        {data.summary.length ? (
          <FigureGroup title="In short">
            <ul
              className="list-disc space-y-1 py-2 pr-3 pl-8 text-[13px]"
              data-testid="health-summary"
            >
              {data.summary.map((line) => (
                <li key={line}>{line}</li>
              ))}
            </ul>
          </FigureGroup>
        ) : null}
      </div>
      <p className="text-xs text-ink-muted">
        Version {data.version}, {data.weighting} weighting. A rebuild is recommended when the drift
        exceeds {formatShare(data.thresholds.drift, 0)} or the folded-in share{' '}
        {formatShare(data.thresholds.foldedShare, 0)}.
      </p>
    </div>
  );
}

function FigureGroup({ title, children }: { title: string; children: ReactNode }) {
  return (
    <section className="rounded-md border border-line bg-panel" aria-label={title}>
      <h2 className="border-b border-line px-4 py-2 text-sm font-semibold">{title}</h2>
      <dl className="divide-y divide-line">{children}</dl>
    </section>
  );
}

function HealthFigure({
  label,
  value,
  words,
  testId,
  children,
}: {
  label: string;
  value: string;
  words: string;
  testId: string;
  children?: ReactNode;
}) {
  return (
    <div className="grid grid-cols-[11rem_minmax(0,1fr)] gap-x-3 px-4 py-2">
      <dt className="text-[13px] font-medium">{label}</dt>
      <dd className="text-right text-[15px] font-semibold tabular-nums" data-testid={testId}>
        {value}
      </dd>
      <dd className="col-span-2 mt-0.5 text-[13px] text-ink-muted">
        {words}
        {children}
      </dd>
    </div>
  );
}

/** A bar to the value with a tick at the threshold; the numbers are written beside it. */
function ThresholdBar({
  value,
  threshold,
  label,
}: {
  value: number;
  threshold: number;
  label: string;
}) {
  const top = Math.max(threshold * 2, value, 1e-9);
  const over = value > threshold;
  return (
    <span className="mt-1.5 flex items-center gap-2">
      <span
        role="meter"
        aria-label={label}
        aria-valuemin={0}
        aria-valuemax={top}
        aria-valuenow={value}
        aria-valuetext={`${formatShare(value)}, threshold ${formatShare(threshold, 0)}`}
        className="relative h-2 w-48 rounded-sm bg-sunk"
      >
        <span
          className={`absolute inset-y-0 left-0 rounded-sm ${over ? 'bg-warn' : 'bg-ok'}`}
          style={{ width: `${Math.min(value / top, 1) * 100}%` }}
        />
        <span
          aria-hidden="true"
          className="absolute -inset-y-1 w-0.5 bg-ink"
          style={{ left: `${(threshold / top) * 100}%` }}
        />
      </span>
      <span className="text-xs">
        {over ? 'above' : 'below'} the {formatShare(threshold, 0)} threshold
      </span>
    </span>
  );
}
