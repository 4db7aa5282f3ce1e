import type { QueryClient } from '@tanstack/react-query';
import { type LoaderFunctionArgs, useSearchParams } from 'react-router-dom';
import {
  CONCEPT_DIMENSIONS_DEFAULT,
  CONCEPT_DIMENSIONS_MAX,
  type DimensionsQuery,
} from '@shared/schemas/concepts';
import { EmptyState, Select, SkeletonRows, Spinner } from '@/components/ui';
import { dimensionsQueryOptions, useDimensions } from '@/features/concepts/api/get-dimensions';
import { DimensionCard } from '@/features/concepts/components/dimension-card';
import { useMatterPermission } from '@/lib/authorization';
import { ConceptQuery } from '@/features/concepts/components/concept-query';
import { ConceptViewForbidden } from './concepts';
import { parseMatterId, useMatterId } from './layout';

const COUNTS = [6, 12, 24, CONCEPT_DIMENSIONS_MAX];

function queryFrom(params: URLSearchParams): DimensionsQuery {
  const count = Number(params.get('count'));
  return {
    count: COUNTS.includes(count) ? count : CONCEPT_DIMENSIONS_DEFAULT,
    terms: 10,
    docs: 5,
  };
}

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ params, request }: LoaderFunctionArgs) => {
    const matterId = parseMatterId(params.matterId);
    if (Number.isNaN(matterId)) return null;
    const query = queryFrom(new URL(request.url).searchParams);
    void queryClient.prefetchQuery(dimensionsQueryOptions(matterId, query));
    return null;
  };

/** Concepts: the leading dimensions, what loads on each end, and the lead's names for them. */
export function ConceptsDimensionsRoute() {
  const matterId = useMatterId();
  if (!useMatterPermission('concepts.view')) return <ConceptViewForbidden />;
  return <DimensionsPage matterId={matterId} />;
}

function DimensionsPage({ matterId }: { matterId: number }) {
  const [params, setParams] = useSearchParams();
  const query = queryFrom(params);
  const dimensions = useDimensions(matterId, query);

  return (
    <div data-testid="concepts-dimensions" className="space-y-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <p className="max-w-prose text-[13px] text-ink-muted">
          Each dimension is a direction in the concept space. The terms with the largest loadings at
          either end, and the documents lying furthest along it, usually show what it is about; the
          two ends are opposites, not two topics of equal standing. Dimension 1 mostly follows
          overall term weight.
        </p>
        <div className="flex items-end gap-2">
          {dimensions.isFetching && !dimensions.isPending ? (
            <Spinner size="sm" label="Refreshing" />
          ) : null}
          <Select
            label="Dimensions shown"
            className="w-40"
            options={COUNTS.map((count) => ({ value: String(count), label: `First ${count}` }))}
            value={String(query.count)}
            onChange={(event) => setParams({ count: event.target.value }, { replace: true })}
          />
        </div>
      </div>
      <ConceptQuery
        query={dimensions}
        errorTitle="The concept dimensions could not be loaded"
        loading={<SkeletonRows rows={8} label="Loading the concept dimensions" />}
      >
        {(data) =>
          data.dimensions.length === 0 ? (
            <EmptyState title="No dimensions">
              The serving index has no concept dimensions.
            </EmptyState>
          ) : (
            <>
              <p className="text-[13px] text-ink-muted">
                Version {data.version}, first {data.dimensions.length} of k = {data.k} dimensions.
              </p>
              <div className="space-y-3">
                {data.dimensions.map((dimension) => (
                  <DimensionCard
                    key={`${data.indexId}-${dimension.dim}`}
                    matterId={matterId}
                    dimension={dimension}
                  />
                ))}
              </div>
            </>
          )
        }
      </ConceptQuery>
    </div>
  );
}
