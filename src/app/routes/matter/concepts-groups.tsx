import type { QueryClient } from '@tanstack/react-query';
import { type FormEvent, useId, useState } from 'react';
import { Link, type LoaderFunctionArgs, useSearchParams } from 'react-router-dom';
import {
  GROUPS_MAX,
  GROUPS_MIN,
  type GroupingResponse,
  type GroupingSummary,
} from '@shared/schemas/concepts';
import {
  Badge,
  Button,
  EmptyState,
  Notice,
  Select,
  SkeletonRows,
  TBody,
  THead,
  Table,
  Td,
  Th,
  Tr,
  describeError,
  inputClass,
} from '@/components/ui';
import { useCreateGrouping } from '@/features/concepts/api/create-grouping';
import { useGrouping } from '@/features/concepts/api/get-grouping';
import { groupingsQueryOptions, useGroupings } from '@/features/concepts/api/get-groupings';
import { formatFigure } from '@/features/concepts/format';
import { fieldErrorOf } from '@/lib/api-client';
import { useMatterPermission } from '@/lib/authorization';
import { formatDateTime } from '@/lib/format';
import { ConceptQuery } from '@/features/concepts/components/concept-query';
import { ConceptViewForbidden } from './concepts';
import { parseMatterId, useMatterId } from './layout';

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ params }: LoaderFunctionArgs) => {
    const matterId = parseMatterId(params.matterId);
    if (Number.isNaN(matterId)) return null;
    void queryClient.prefetchQuery(groupingsQueryOptions(matterId));
    return null;
  };

/**
 * "Search within this group": a concept search for the group's top terms, filtered to the
 * group (filters.groupId). The search page reads q and mode from the address
 * (src/features/search/search-state.ts); `group` is the group filter's parameter.
 */
export function groupSearchHref(matterId: number, groupId: number, words: string[]): string {
  const params = new URLSearchParams({
    q: words.join(' '),
    mode: 'concept',
    group: String(groupId),
  });
  return `/matters/${matterId}/search?${params.toString()}`;
}

/** Groups: k-means over the document vectors, each group with its size and top terms. */
export function ConceptsGroupsRoute() {
  const matterId = useMatterId();
  if (!useMatterPermission('concepts.view')) return <ConceptViewForbidden />;
  return <GroupsPage matterId={matterId} />;
}

function GroupsPage({ matterId }: { matterId: number }) {
  const [params, setParams] = useSearchParams();
  const groupings = useGroupings(matterId);
  const chosenRaw = Number(params.get('grouping'));
  const listed = groupings.data?.groupings ?? [];
  const chosenId =
    Number.isInteger(chosenRaw) && chosenRaw > 0 ? chosenRaw : (listed[0]?.id ?? null);
  const grouping = useGrouping(matterId, chosenId);

  function choose(id: number) {
    setParams({ grouping: String(id) }, { replace: true });
  }

  return (
    <div data-testid="concepts-groups" className="space-y-4">
      <p className="max-w-prose text-[13px] text-ink-muted">
        k-means (Lloyd&apos;s algorithm) splits the documents into the chosen number of groups by
        their direction in the concept space; each group is described by the terms its centre weighs
        most. The same number of groups and seed give the same groups again. Groups are an aid to
        finding one&apos;s way through the matter, not a classification of the documents.
      </p>
      <GroupingForm matterId={matterId} onCreated={choose} />
      <ConceptQuery
        query={groupings}
        errorTitle="The groupings could not be loaded"
        loading={<SkeletonRows rows={3} label="Loading the groupings" />}
      >
        {(data) =>
          data.groupings.length === 0 ? (
            <EmptyState title="No grouping has been run on this index version yet">
              Choose a number of groups above and run it.
            </EmptyState>
          ) : (
            <div className="space-y-3">
              <Select
                label="Grouping"
                className="max-w-xl"
                value={chosenId ? String(chosenId) : ''}
                onChange={(event) => choose(Number(event.target.value))}
                options={data.groupings.map((g) => ({
                  value: String(g.id),
                  label: groupingName(g),
                }))}
                data-testid="grouping-select"
              />
              {chosenId == null ? null : (
                <ConceptQuery
                  query={grouping}
                  errorTitle="The grouping could not be loaded"
                  loading={<SkeletonRows rows={6} label="Loading the groups" />}
                >
                  {(detail) => <GroupingView matterId={matterId} detail={detail} />}
                </ConceptQuery>
              )}
            </div>
          )
        }
      </ConceptQuery>
    </div>
  );
}

function groupingName(g: GroupingSummary): string {
  return `${g.groups} groups · seed ${g.seed} · ${formatDateTime(g.createdAt)}${g.createdBy ? ` · ${g.createdBy.name}` : ''}`;
}

function GroupingForm({
  matterId,
  onCreated,
}: {
  matterId: number;
  onCreated: (id: number) => void;
}) {
  const id = useId();
  const create = useCreateGrouping(matterId);
  const [groups, setGroups] = useState('8');
  const [seed, setSeed] = useState('1');
  const [localError, setLocalError] = useState<string | null>(null);

  function submit(event: FormEvent) {
    event.preventDefault();
    const g = Number(groups);
    const s = Number(seed);
    if (!Number.isInteger(g) || g < GROUPS_MIN || g > GROUPS_MAX) {
      setLocalError(
        `The number of groups must be a whole number from ${GROUPS_MIN} to ${GROUPS_MAX}.`,
      );
      return;
    }
    if (!Number.isInteger(s) || s < 0) {
      setLocalError('The seed must be a whole number, 0 or more.');
      return;
    }
    setLocalError(null);
    create.mutate({ groups: g, seed: s }, { onSuccess: (answer) => onCreated(answer.grouping.id) });
  }

  const groupsError = localError ?? fieldErrorOf(create.error, 'groups');
  return (
    <form
      onSubmit={submit}
      noValidate
      className="flex flex-wrap items-end gap-3 rounded-md border border-line bg-panel p-3"
      aria-label="Run k-means"
    >
      <div className="w-36 space-y-1">
        <label htmlFor={`${id}-groups`} className="block text-[13px] font-medium">
          Number of groups
        </label>
        <input
          id={`${id}-groups`}
          type="number"
          min={GROUPS_MIN}
          max={GROUPS_MAX}
          value={groups}
          onChange={(event) => setGroups(event.target.value)}
          aria-invalid={groupsError ? true : undefined}
          className={inputClass}
          data-testid="groups-count"
        />
      </div>
      <div className="w-28 space-y-1">
        <label htmlFor={`${id}-seed`} className="block text-[13px] font-medium">
          Seed
        </label>
        <input
          id={`${id}-seed`}
          type="number"
          min={0}
          value={seed}
          onChange={(event) => setSeed(event.target.value)}
          className={inputClass}
        />
      </div>
      <Button type="submit" variant="primary" busy={create.isPending} data-testid="groups-run">
        Run k-means
      </Button>
      {groupsError ? (
        <p className="basis-full text-[13px] font-medium text-danger" role="alert">
          {groupsError}
        </p>
      ) : create.isError ? (
        <Notice tone="danger" className="basis-full" title="The groups could not be made">
          {fieldErrorOf(create.error, 'seed') ?? describeError(create.error)}
        </Notice>
      ) : null}
    </form>
  );
}

function GroupingView({ matterId, detail }: { matterId: number; detail: GroupingResponse }) {
  const { grouping, groups } = detail;
  const largest = Math.max(...groups.map((g) => g.size), 1);
  return (
    <div className="space-y-2" data-testid="grouping" data-grouping-id={grouping.id}>
      <p className="text-[13px] text-ink-muted">
        {grouping.documents.toLocaleString()} documents of version {grouping.version} in{' '}
        {grouping.groups} groups, over the first {grouping.dims} concept dimensions;{' '}
        {grouping.iterations} iterations,{' '}
        {grouping.converged ? (
          'settled'
        ) : (
          <Badge tone="warn">stopped at the iteration cap before settling</Badge>
        )}
        ; within-group sum of squares {formatFigure(grouping.inertia)}.
      </p>
      <Table caption={`Groups of the ${grouping.groups}-group k-means run, largest first`}>
        <THead>
          <tr>
            <Th className="w-12">Group</Th>
            <Th className="w-48">Documents</Th>
            <Th>Top terms</Th>
            <Th className="w-48">
              <span className="sr-only">Search</span>
            </Th>
          </tr>
        </THead>
        <TBody>
          {groups.map((group) => (
            <Tr key={group.id} data-testid="group-row" data-group-id={group.id}>
              <Td className="font-semibold tabular-nums">{group.number}</Td>
              <Td>
                <div className="flex items-center gap-2">
                  <span aria-hidden="true" className="relative h-2 w-24 rounded-sm bg-sunk">
                    <span
                      className="absolute inset-y-0 left-0 rounded-sm bg-accent"
                      style={{ width: `${(group.size / largest) * 100}%` }}
                    />
                  </span>
                  <span className="tabular-nums">{group.size.toLocaleString()}</span>
                </div>
              </Td>
              <Td className="text-[13px]">
                {group.topTerms.length ? (
                  group.topTerms.map((t) => t.label).join(', ')
                ) : (
                  <span className="text-ink-muted">no distinctive terms</span>
                )}
              </Td>
              <Td className="text-right">
                <Link
                  to={groupSearchHref(
                    matterId,
                    group.id,
                    group.topTerms.slice(0, 5).map((t) => t.label),
                  )}
                  className="text-[13px] font-medium text-accent-strong underline-offset-2 hover:underline"
                  data-testid="group-search"
                >
                  Search within this group
                </Link>
              </Td>
            </Tr>
          ))}
        </TBody>
      </Table>
    </div>
  );
}
