import { useState } from 'react';
import { EmptyState, PageHeader, QueryBoundary } from '@/components/ui';
import { ReviewCaution } from '@/components/review-caution';
import { formatDateTime } from '@/lib/format';
import { useProduction } from '../api/get-production';
import { useProductions } from '../api/get-productions';
import { ProductionDetail } from './production-detail';
import { ProductionForm } from './production-form';

function SelectedProduction({
  matterId,
  productionId,
}: {
  matterId: number;
  productionId: number;
}) {
  const production = useProduction(matterId, productionId);
  return (
    <QueryBoundary query={production} errorTitle="The production could not be loaded">
      {({ production: p }) => <ProductionDetail matterId={matterId} production={p} />}
    </QueryBoundary>
  );
}

/** Define, check, build and download the matter's productions. */
export function ProductionsPage({ matterId }: { matterId: number }) {
  const productions = useProductions(matterId);
  const [selected, setSelected] = useState<number | null>(null);
  const current = selected ?? productions.data?.productions[0]?.id ?? null;
  return (
    <div className="space-y-5" data-testid="productions-page">
      <PageHeader
        title="Productions"
        description="Bates-numbered sets for the other side: endorsed PDF pages, text, natives where chosen, a metadata file and a manifest of SHA-256 hashes. A built production is locked; a correction is a new production."
      />
      <ReviewCaution />
      <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_minmax(0,1.3fr)]">
        <section
          aria-labelledby="new-production"
          className="rounded-md border border-line bg-panel p-4"
        >
          <h2 id="new-production" className="mb-3 text-base font-semibold">
            New production
          </h2>
          <ProductionForm matterId={matterId} onCreated={(p) => setSelected(p.id)} />
        </section>
        <div className="space-y-4">
          {current !== null ? (
            <SelectedProduction matterId={matterId} productionId={current} />
          ) : null}
          <QueryBoundary query={productions} errorTitle="The productions could not be loaded">
            {({ productions: list }) =>
              list.length === 0 ? (
                <EmptyState title="No productions yet" />
              ) : (
                <ul
                  className="divide-y divide-line rounded-md border border-line bg-panel text-sm"
                  aria-label="Productions"
                >
                  {list.map((p) => (
                    <li key={p.id}>
                      <button
                        type="button"
                        className="flex w-full items-baseline justify-between gap-3 px-3 py-2 text-left hover:bg-sunk aria-[current=true]:bg-accent-soft"
                        aria-current={p.id === current}
                        onClick={() => setSelected(p.id)}
                        data-testid="production-row"
                      >
                        <span className="font-medium">{p.name}</span>
                        <span className="text-ink-muted">
                          {p.batesRange ? `${p.batesRange.first} – ${p.batesRange.last}` : p.state}
                          {' · '}
                          {formatDateTime(p.createdAt)}
                        </span>
                      </button>
                    </li>
                  ))}
                </ul>
              )
            }
          </QueryBoundary>
        </div>
      </div>
    </div>
  );
}
