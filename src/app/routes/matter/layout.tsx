import type { QueryClient } from '@tanstack/react-query';
import { type LoaderFunctionArgs, NavLink, Outlet, useParams } from 'react-router-dom';
import { ROLE_LABELS, roleCan } from '@shared/roles';
import { Badge, ErrorPanel, LoadingBlock } from '@/components/ui';
import { matterQueryOptions, useMatter } from '@/features/matters/api/get-matter';
import { MATTER_SECTIONS, matterSectionHref } from '@/features/matters/matter-sections';
import { isApiError } from '@/lib/api-client';
import { MatterRoleProvider } from '@/lib/authorization';
import { cn } from '@/lib/cn';
import { NotFoundPanel } from '../not-found';

export function parseMatterId(raw: string | undefined): number {
  const id = Number(raw);
  return Number.isInteger(id) && id > 0 ? id : NaN;
}

export function useMatterId(): number {
  return parseMatterId(useParams().matterId);
}

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ params }: LoaderFunctionArgs) => {
    const matterId = parseMatterId(params.matterId);
    if (!Number.isNaN(matterId)) void queryClient.prefetchQuery(matterQueryOptions(matterId));
    return null;
  };

/** The frame of every matter page: the matter's name, its sections, and the page. */
export function MatterLayout() {
  const matterId = useMatterId();
  const matter = useMatter(matterId);

  if (Number.isNaN(matterId)) return <NotFoundPanel />;
  if (matter.isPending) {
    return (
      <div className="mx-auto max-w-[88rem] px-4 py-6">
        <LoadingBlock label="Opening the matter…" />
      </div>
    );
  }
  if (matter.isError) {
    // A matter you hold no role on answers 404 like one that does not exist.
    if (isApiError(matter.error) && matter.error.status === 404)
      return <NotFoundPanel what="matter" />;
    return (
      <div className="mx-auto max-w-[88rem] px-4 py-6">
        <ErrorPanel
          error={matter.error}
          title="The matter could not be opened"
          onRetry={() => void matter.refetch()}
        />
      </div>
    );
  }

  const { matter: detail, role } = matter.data;
  const sections = MATTER_SECTIONS.filter((section) => roleCan(role, section.permission));

  return (
    <MatterRoleProvider role={role}>
      <div className="mx-auto flex max-w-[88rem] gap-6 px-4 py-6">
        <aside className="w-52 shrink-0" aria-label="Matter">
          <div className="mb-3 border-b border-line pb-3">
            <p className="text-[11px] font-semibold tracking-wider text-ink-faint uppercase">
              Matter
            </p>
            <p className="mt-0.5 leading-snug font-semibold text-ink" data-testid="matter-name">
              {detail.name}
            </p>
            <div className="mt-1.5 flex items-center gap-2">
              <Badge tone={role === 'lead' ? 'accent' : 'neutral'} className="">
                <span data-testid="matter-role">{ROLE_LABELS[role]}</span>
              </Badge>
              <span className="font-mono text-xs text-ink-muted">{detail.controlPrefix}</span>
            </div>
          </div>
          <nav aria-label="Matter sections">
            <ul className="space-y-0.5" data-testid="matter-nav">
              {sections.map((section) => (
                <li key={section.id}>
                  <NavLink
                    end={section.path === ''}
                    to={matterSectionHref(detail.id, section)}
                    data-testid={`matter-nav-${section.id}`}
                    className={({ isActive }) =>
                      cn(
                        'block rounded-md border-l-[3px] px-2.5 py-1.5 text-sm',
                        isActive
                          ? 'border-accent bg-accent-soft font-semibold text-accent-strong'
                          : 'border-transparent text-ink-muted hover:bg-sunk hover:text-ink',
                      )
                    }
                  >
                    {section.label}
                  </NavLink>
                </li>
              ))}
            </ul>
          </nav>
        </aside>
        <main className="min-w-0 flex-1">
          <Outlet />
        </main>
      </div>
    </MatterRoleProvider>
  );
}
