import type { QueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { AUDIT_ACTIONS, AUDIT_ACTION_LABELS } from '@shared/audit';
import { useSearchParams } from 'react-router-dom';
import {
  Button,
  DownloadLink,
  EmptyState,
  Notice,
  PageHeader,
  QueryBoundary,
  Select,
  Spinner,
  TBody,
  TextField,
  THead,
  Table,
  Td,
  Th,
  Tr,
} from '@/components/ui';
import { useMembers } from '@/features/members/api/get-members';
import {
  type AuditEvent,
  type AuditFilters,
  auditCsvHref,
  auditEventsQueryOptions,
  useAuditEvents,
} from '@/features/audit/api/get-audit-events';
import { useMatterPermission } from '@/lib/authorization';
import { formatDateTime, humanizeAction } from '@/lib/format';
import { parseMatterId, useMatterId } from './layout';

const PAGE_SIZE = 50;

function actionLabel(action: string): string {
  return (AUDIT_ACTION_LABELS as Record<string, string>)[action] ?? humanizeAction(action);
}

function filtersFrom(params: URLSearchParams): AuditFilters {
  const before = Number(params.get('before'));
  return {
    actor: params.get('actor') || undefined,
    action: params.get('action') || undefined,
    from: params.get('from') || undefined,
    to: params.get('to') || undefined,
    before: Number.isInteger(before) && before > 0 ? before : undefined,
    limit: PAGE_SIZE,
  };
}

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ params, request }: LoaderFunctionArgs) => {
    const matterId = parseMatterId(params.matterId);
    if (Number.isNaN(matterId)) return null;
    void queryClient.prefetchQuery(
      auditEventsQueryOptions(matterId, filtersFrom(new URL(request.url).searchParams)),
    );
    return null;
  };

export function ActivityRoute() {
  const matterId = useMatterId();
  const allowed = useMatterPermission('audit.read');
  if (!allowed) {
    return (
      <Notice tone="warn" title="Not available to your role">
        Only the matter lead reads the activity log.
      </Notice>
    );
  }
  return <ActivityLog matterId={matterId} />;
}

function ActivityLog({ matterId }: { matterId: number }) {
  const [params, setParams] = useSearchParams();
  const filters = filtersFrom(params);
  const events = useAuditEvents(matterId, filters);
  // Names for the people events point at (role changes, revocations), from the log's
  // actors and the current members; a former member by the name or e-mail the event kept.
  const members = useMembers(matterId);
  const people = new Map<string, string>();
  for (const actor of events.data?.actors ?? []) {
    people.set(actor.id, actor.name ?? actor.email ?? actor.id);
  }
  for (const member of members.data?.members ?? []) people.set(member.userId, member.name);
  const targetOf = (event: AuditEvent): string | null => {
    if (event.targetType !== 'user' || !event.targetId) return null;
    const { name, email } = event.detail as { name?: string; email?: string };
    return people.get(event.targetId) ?? (name || email) ?? null;
  };
  // Cursors of the newer pages already seen, so "Newer" can step back.
  const [newerCursors, setNewerCursors] = useState<(number | undefined)[]>([]);

  function update(changes: Record<string, string | number | undefined>) {
    const next = new URLSearchParams(params);
    for (const [key, value] of Object.entries(changes)) {
      if (value === undefined || value === '') next.delete(key);
      else next.set(key, String(value));
    }
    setParams(next, { replace: true });
  }

  function setFilter(key: 'actor' | 'action' | 'from' | 'to', value: string) {
    setNewerCursors([]);
    update({ [key]: value, before: undefined });
  }

  const actorOptions = [
    { value: '', label: 'Everyone' },
    ...(events.data?.actors ?? []).map((actor) => ({
      value: actor.id,
      label: actor.name
        ? `${actor.name} (${actor.email ?? 'no e-mail'})`
        : (actor.email ?? actor.id),
    })),
  ];
  const actionOptions = [
    { value: '', label: 'All actions' },
    ...AUDIT_ACTIONS.map((action) => ({ value: action, label: actionLabel(action) })),
  ];

  return (
    <div data-testid="activity-page">
      <PageHeader
        title="Activity log"
        description="An append-only record of who did what on this matter, newest first."
      />
      <div className="mb-3 flex flex-wrap items-end gap-3" role="group" aria-label="Filter the log">
        <Select
          label="Person"
          className="w-72"
          options={actorOptions}
          value={filters.actor ?? ''}
          onChange={(event) => setFilter('actor', event.target.value)}
          data-testid="audit-filter-actor"
        />
        <Select
          label="Action"
          className="w-60"
          options={actionOptions}
          value={filters.action ?? ''}
          onChange={(event) => setFilter('action', event.target.value)}
          data-testid="audit-filter-action"
        />
        <TextField
          label="From day"
          type="date"
          className="w-44"
          value={filters.from ?? ''}
          max={filters.to}
          onChange={(event) => setFilter('from', event.target.value)}
          data-testid="audit-filter-from"
        />
        <TextField
          label="To day"
          type="date"
          className="w-44"
          value={filters.to ?? ''}
          min={filters.from}
          onChange={(event) => setFilter('to', event.target.value)}
          data-testid="audit-filter-to"
        />
        <DownloadLink href={auditCsvHref(matterId, filters)} data-testid="audit-csv">
          Export CSV
        </DownloadLink>
        {events.isFetching && !events.isPending ? (
          <Spinner size="sm" label="Updating" className="mb-2.5 text-ink-muted" />
        ) : null}
      </div>
      <QueryBoundary query={events} errorTitle="The activity log could not be loaded">
        {({ events: list, nextCursor }) =>
          list.length === 0 ? (
            <EmptyState title="No activity matches these filters" />
          ) : (
            <>
              <Table caption="Activity on this matter, newest first" data-testid="audit-table">
                <THead>
                  <tr>
                    <Th className="w-48">When</Th>
                    <Th className="w-64">Person</Th>
                    <Th className="w-52">Action</Th>
                    <Th>Detail</Th>
                  </tr>
                </THead>
                <TBody>
                  {list.map((event) => (
                    <Tr key={event.id} data-testid="audit-row">
                      <Td className="whitespace-nowrap text-ink-muted tabular-nums">
                        {formatDateTime(event.at)}
                      </Td>
                      <Td>
                        {event.actor?.name ?? event.actor?.email ?? (
                          <span className="text-ink-muted">System</span>
                        )}
                        {event.actor?.name && event.actor.email ? (
                          <span className="block text-xs text-ink-muted">{event.actor.email}</span>
                        ) : null}
                      </Td>
                      <Td>
                        <span title={event.action}>{actionLabel(event.action)}</span>
                      </Td>
                      <Td className="text-[13px] text-ink-muted">
                        {[
                          targetOf(event),
                          // The target's name is already shown in front of the detail.
                          describeDetail(event.detail, event.targetType === 'user' ? ['name'] : []),
                        ]
                          .filter(Boolean)
                          .join(' · ') || '—'}
                      </Td>
                    </Tr>
                  ))}
                </TBody>
              </Table>
              <nav aria-label="Pages of the log" className="mt-3 flex items-center gap-3 text-sm">
                <Button
                  size="sm"
                  disabled={filters.before === undefined}
                  onClick={() => {
                    const previous = newerCursors[newerCursors.length - 1];
                    setNewerCursors(newerCursors.slice(0, -1));
                    update({ before: previous });
                  }}
                >
                  Newer
                </Button>
                <span className="text-ink-muted tabular-nums">
                  {newerCursors.length * PAGE_SIZE + 1}–
                  {newerCursors.length * PAGE_SIZE + list.length}
                </span>
                <Button
                  size="sm"
                  disabled={nextCursor === null}
                  onClick={() => {
                    setNewerCursors([...newerCursors, filters.before]);
                    update({ before: nextCursor ?? undefined });
                  }}
                >
                  Older
                </Button>
              </nav>
            </>
          )
        }
      </QueryBoundary>
    </div>
  );
}

function describeDetail(
  detail: Record<string, unknown> | null | undefined,
  omit: readonly string[] = [],
): string {
  if (!detail) return '';
  return Object.entries(detail)
    .filter(([key]) => !omit.includes(key))
    .filter(([, value]) => value !== null && value !== undefined && value !== '')
    .map(
      ([key, value]) =>
        `${key}: ${typeof value === 'object' ? JSON.stringify(value) : String(value)}`,
    )
    .join(', ');
}
