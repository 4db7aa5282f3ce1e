import type { QueryClient } from '@tanstack/react-query';
import { useMemo } from 'react';
import { type LoaderFunctionArgs, useNavigate, useSearchParams } from 'react-router-dom';
import {
  CONCEPT_DIMENSIONS_MAX,
  type DimensionsResponse,
  type MapQuery,
} from '@shared/schemas/concepts';
import { EmptyState, Select, SkeletonRows, Spinner } from '@/components/ui';
import { useDimensions } from '@/features/concepts/api/get-dimensions';
import { documentMapQueryOptions, useDocumentMap } from '@/features/concepts/api/get-document-map';
import { type AxisEnds, DocumentMap } from '@/features/concepts/components/document-map';
import type { ColourBy } from '@/features/concepts/map-model';
import { useMatterPermission } from '@/lib/authorization';
import { ConceptQuery } from '@/features/concepts/components/concept-query';
import { ConceptViewForbidden } from './concepts';
import { parseMatterId, useMatterId } from './layout';

function positive(raw: string | null, fallback: number): number {
  const value = Number(raw);
  return Number.isInteger(value) && value > 0 ? value : fallback;
}

function queryFrom(params: URLSearchParams): MapQuery {
  const x = positive(params.get('x'), 1);
  let y = positive(params.get('y'), 2);
  if (y === x) y = x === 1 ? 2 : 1;
  return { x, y };
}

const AXIS_TERMS = { count: CONCEPT_DIMENSIONS_MAX, terms: 3, docs: 1 };

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ params, request }: LoaderFunctionArgs) => {
    const matterId = parseMatterId(params.matterId);
    if (Number.isNaN(matterId)) return null;
    const query = queryFrom(new URL(request.url).searchParams);
    void queryClient.prefetchQuery(documentMapQueryOptions(matterId, query));
    return null;
  };

/** Document map: every document on two concept dimensions, coloured by custodian or code. */
export function ConceptsMapRoute() {
  const matterId = useMatterId();
  if (!useMatterPermission('concepts.view')) return <ConceptViewForbidden />;
  return <MapPage matterId={matterId} />;
}

function axisEnds(dimensions: DimensionsResponse | undefined, dim: number): AxisEnds {
  const d = dimensions?.dimensions.find((candidate) => candidate.dim === dim);
  const words = (terms: { label: string }[] | undefined) =>
    terms?.length ? terms.map((t) => t.label).join(', ') : '';
  return {
    positive: words(d?.positiveTerms),
    negative: words(d?.negativeTerms),
    label: d?.label?.label ?? '',
  };
}

function MapPage({ matterId }: { matterId: number }) {
  const navigate = useNavigate();
  const [params, setParams] = useSearchParams();
  const query = queryFrom(params);
  const colourBy: ColourBy = params.get('colour') === 'code' ? 'code' : 'custodian';
  const map = useDocumentMap(matterId, query);
  const dimensions = useDimensions(matterId, AXIS_TERMS);
  const k = map.data?.k ?? dimensions.data?.k ?? Math.max(query.x, query.y, 2);

  const axes = useMemo(
    () => ({ x: axisEnds(dimensions.data, query.x), y: axisEnds(dimensions.data, query.y) }),
    [dimensions.data, query.x, query.y],
  );

  function update(changes: Record<string, string>) {
    const next = new URLSearchParams(params);
    for (const [key, value] of Object.entries(changes)) next.set(key, value);
    setParams(next, { replace: true });
  }

  const dimOptions = Array.from({ length: k }, (_, index) => {
    const dim = index + 1;
    const label = dimensions.data?.dimensions.find((d) => d.dim === dim)?.label?.label;
    return { value: String(dim), label: label ? `${dim} · ${label}` : `Dimension ${dim}` };
  });

  return (
    <div data-testid="concepts-map" className="space-y-3">
      <div className="flex flex-wrap items-end gap-3" role="group" aria-label="What the map shows">
        <Select
          label="Across (x)"
          className="w-48"
          options={dimOptions.filter((o) => o.value !== String(query.y))}
          value={String(query.x)}
          onChange={(event) => update({ x: event.target.value })}
          data-testid="map-x"
        />
        <Select
          label="Up (y)"
          className="w-48"
          options={dimOptions.filter((o) => o.value !== String(query.x))}
          value={String(query.y)}
          onChange={(event) => update({ y: event.target.value })}
          data-testid="map-y"
        />
        <Select
          label="Colour and mark by"
          className="w-44"
          options={[
            { value: 'custodian', label: 'Custodian' },
            { value: 'code', label: 'Code' },
          ]}
          value={colourBy}
          onChange={(event) => update({ colour: event.target.value })}
          data-testid="map-colour"
        />
        {map.isFetching && !map.isPending ? (
          <span className="flex h-9 items-center">
            <Spinner size="sm" label="Loading the map" />
          </span>
        ) : null}
      </div>
      <ConceptQuery
        query={map}
        errorTitle="The document map could not be loaded"
        loading={<SkeletonRows rows={10} label="Loading the document map" />}
      >
        {(data) =>
          data.count === 0 ? (
            <EmptyState title="No documents in the index">
              The map shows the documents of the serving index version; it has none yet.
            </EmptyState>
          ) : (
            <figure className="m-0 space-y-2">
              <DocumentMap
                data={data}
                colourBy={colourBy}
                axes={axes}
                onOpen={(documentId) =>
                  void navigate(`/matters/${matterId}/documents/${documentId}`)
                }
              />
              <figcaption className="max-w-prose text-[13px] text-ink-muted">
                Each mark is one of the {data.count.toLocaleString()} documents of index version{' '}
                {data.version}, placed by the cosine between the document and concept dimension{' '}
                {data.dims[0]} (across) and dimension {data.dims[1]} (up), so every point lies
                within −1 to 1. Documents near each other use the matter&apos;s vocabulary alike on
                these two dimensions; they may still differ on the other {Math.max(data.k - 2, 0)}.
                The words at the ends of the axes are the strongest terms there. Marks differ by
                shape as well as colour.
              </figcaption>
            </figure>
          )
        }
      </ConceptQuery>
    </div>
  );
}
