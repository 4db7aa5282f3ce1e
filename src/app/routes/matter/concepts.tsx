import { NavLink, Navigate, Outlet } from 'react-router-dom';
import type { MatterPermission } from '@shared/roles';
import { ReviewCaution } from '@/components/review-caution';
import { Notice, PageHeader } from '@/components/ui';
import { useRefreshOnNewVersion } from '@/features/concepts/hooks/use-refresh-on-new-version';
import { useMatterRole } from '@/lib/authorization';
import { roleCan } from '@shared/roles';
import { cn } from '@/lib/cn';
import { useMatterId } from './layout';

/** The views of the concept space, in the order the tabs list them. */
export const CONCEPT_VIEWS: readonly {
  path: string;
  label: string;
  permission: MatterPermission;
}[] = [
  { path: 'spectrum', label: 'Spectrum', permission: 'concepts.view' },
  { path: 'dimensions', label: 'Concepts', permission: 'concepts.view' },
  { path: 'terms', label: 'Term neighbours', permission: 'concepts.view' },
  { path: 'map', label: 'Document map', permission: 'concepts.view' },
  { path: 'groups', label: 'Groups', permission: 'concepts.view' },
  { path: 'health', label: 'Index health', permission: 'concepts.view' },
];

/**
 * The concept space of the matter's serving index version: one frame with a tab per
 * view. It follows the index state, so a finished rebuild refreshes every view.
 */
export function ConceptsLayout() {
  const matterId = useMatterId();
  const role = useMatterRole();
  useRefreshOnNewVersion(matterId);
  const views = CONCEPT_VIEWS.filter((view) => roleCan(role, view.permission));
  if (views.length === 0) {
    return (
      <Notice tone="warn" title="Not available to your role">
        Your role does not include viewing this matter&apos;s concept space.
      </Notice>
    );
  }
  return (
    <div data-testid="concepts-page">
      <PageHeader
        title="Concept space"
        description="How the matter's concept index is built and what it has learnt: its spectrum, its leading concepts, related terms, a map of the documents, groups, and its health."
      />
      <nav aria-label="Concept space views" className="mb-5 border-b border-line">
        <ul className="-mb-px flex flex-wrap gap-1">
          {views.map((view) => (
            <li key={view.path}>
              <NavLink
                to={`/matters/${matterId}/concepts/${view.path}`}
                data-testid={`concepts-tab-${view.path}`}
                className={({ isActive }) =>
                  cn(
                    'block border-b-2 px-3 py-2 text-sm',
                    isActive
                      ? 'border-accent font-semibold text-accent-strong'
                      : 'border-transparent text-ink-muted hover:border-line-strong hover:text-ink',
                  )
                }
              >
                {view.label}
              </NavLink>
            </li>
          ))}
        </ul>
      </nav>
      <Outlet />
      <ReviewCaution compact className="mt-8" />
    </div>
  );
}

/** /matters/:id/concepts opens the first view the role may see. */
export function ConceptsIndexRoute() {
  const matterId = useMatterId();
  const role = useMatterRole();
  const first = CONCEPT_VIEWS.find((view) => roleCan(role, view.permission));
  return <Navigate to={`/matters/${matterId}/concepts/${first?.path ?? 'health'}`} replace />;
}

/** Shown by a view whose permission the role lacks (reached by typing its address). */
export function ConceptViewForbidden() {
  return (
    <Notice tone="warn" title="Not available to your role">
      Your role does not include this view of the concept space.
    </Notice>
  );
}
