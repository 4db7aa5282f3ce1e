import type { QueryClient } from '@tanstack/react-query';
import type { LoaderFunctionArgs } from 'react-router';
import { useSearchParams } from 'react-router';
import {
  Button,
  EmptyState,
  Notice,
  PageHeader,
  QueryBoundary,
  Select,
  Spinner,
  TBody,
  THead,
  Table,
  Td,
  Th,
  Tr,
} from '../../../components/ui';
import {
  type AuditFilters,
  auditEventsQueryOptions,
  useAuditEvents,
} from '../../../features/audit/api/get-audit-events';
import { useMembers } from '../../../features/members/api/get-members';
import { useMatterPermission } from '../../../lib/authorization';
import { formatDateTime, humanizeAction } from '../../../lib/format';
import { parseMatterId, useMatterId } from './layout';

const PAGE_SIZE = 50;

/** The log's actions this screen offers as a filter (the server may record more). */
const KNOWN_ACTIONS = [
  'auth.sign_in',
  'auth.sign_in_failed',
  'auth.sign_out',
  'auth.password_changed',
  'invitation.sent',
  'invitation.accepted',
  'invitation.revoked',
  'member.granted',
  'member.role_changed',
  'member.revoked',
];

function filtersFrom(params: URLSearchParams): AuditFilters {
  const page = Number(params.get('page') ?? '0');
  return {
    actor: params.get('actor') ?? undefined,
    action: params.get('action') ?? undefined,
    page: Number.isInteger(page) && page >= 0 ? page : 0,
    pageSize: PAGE_SIZE,
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
  const members = useMembers(matterId);

  function setFilter(key: 'actor' | 'action' | 'page', value: string | number | undefined) {
    const next = new URLSearchParams(params);
    if (value === undefined || value === '' || value === 0) next.delete(key);
    else next.set(key, String(value));
    if (key !== 'page') next.delete('page');
    setParams(next, { replace: true });
  }

  const actorOptions = [
    { value: '', label: 'Everyone' },
    ...(
      events.data?.actors ??
      members.data?.members.map((m) => ({ id: m.userId, name: m.name, email: m.email })) ??
      []
    ).map((actor) => ({ value: actor.id, label: `${actor.name} (${actor.email})` })),
  ];
  const actions = events.data?.actions ?? KNOWN_ACTIONS;
  const actionOptions = [
    { value: '', label: 'All actions' },
    ...actions.map((a) => ({ value: a, label: humanizeAction(a) })),
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
        {events.isFetching && !events.isPending ? (
          <Spinner size="sm" label="Updating" className="mb-2.5 text-ink-muted" />
        ) : null}
      </div>
      <QueryBoundary query={events} errorTitle="The activity log could not be loaded">
        {({ events: list, total }) =>
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
                    <Tr key={event.id}>
                      <Td className="whitespace-nowrap text-ink-muted tabular-nums">
                        {formatDateTime(event.at)}
                      </Td>
                      <Td>
                        {event.actorName ?? <span className="text-ink-muted">System</span>}
                        {event.actorEmail ? (
                          <span className="block text-xs text-ink-muted">{event.actorEmail}</span>
                        ) : null}
                      </Td>
                      <Td>
                        <span className="font-mono text-[12.5px]">{event.action}</span>
                      </Td>
                      <Td className="text-[13px] text-ink-muted">
                        {[event.target, describeDetail(event.detail)].filter(Boolean).join(' · ') ||
                          '—'}
                      </Td>
                    </Tr>
                  ))}
                </TBody>
              </Table>
              <nav aria-label="Pages of the log" className="mt-3 flex items-center gap-3 text-sm">
                <Button
                  size="sm"
                  disabled={filters.page === 0}
                  onClick={() => setFilter('page', filters.page - 1)}
                >
                  Newer
                </Button>
                <span className="text-ink-muted tabular-nums">
                  {filters.page * PAGE_SIZE + 1}–{filters.page * PAGE_SIZE + list.length} of {total}
                </span>
                <Button
                  size="sm"
                  disabled={(filters.page + 1) * PAGE_SIZE >= total}
                  onClick={() => setFilter('page', filters.page + 1)}
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

function describeDetail(detail: Record<string, unknown> | null | undefined): string {
  if (!detail) return '';
  return Object.entries(detail)
    .filter(([, value]) => value !== null && value !== undefined && value !== '')
    .map(
      ([key, value]) =>
        `${key}: ${typeof value === 'object' ? JSON.stringify(value) : String(value)}`,
    )
    .join(', ');
}
