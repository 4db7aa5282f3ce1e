import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { ROLE_LABELS, permissionsOf, roleCan } from '@shared/roles';
import { ReviewCaution } from '@/components/review-caution';
import { PageHeader } from '@/components/ui';
import { useMatter } from '@/features/matters/api/get-matter';
import { MATTER_SECTIONS, matterSectionHref } from '@/features/matters/matter-sections';
import { useMatterRole } from '@/lib/authorization';
import { formatDate } from '@/lib/format';
import { PERMISSION_LABELS } from '@/lib/permission-labels';
import { useMatterId } from './layout';

/** The matter's home: what it is, your role and what that role may do, and where to go. */
export function MatterHomeRoute() {
  const matterId = useMatterId();
  const role = useMatterRole();
  // The layout has loaded the matter before rendering this page.
  const home = useMatter(matterId).data;
  if (!home || !role) return null;
  const detail = home.matter;

  const sections = MATTER_SECTIONS.filter(
    (section) => section.path !== '' && roleCan(role, section.permission),
  );
  const permissions = permissionsOf(role);

  return (
    <div data-testid="matter-home">
      <PageHeader
        eyebrow="Overview"
        title={detail.name}
        description={
          detail.description ? (
            <p className="font-document text-[15px] leading-relaxed text-ink">
              {detail.description}
            </p>
          ) : undefined
        }
      />
      <dl className="mb-6 grid grid-cols-2 divide-line overflow-hidden rounded-md border border-line bg-panel sm:grid-cols-4 sm:divide-x">
        <Fact label="Documents" testId="matter-document-count">
          {home.documentCount.toLocaleString()}
        </Fact>
        <Fact label="Team" testId="matter-member-count">
          {home.memberCount} {home.memberCount === 1 ? 'member' : 'members'}
        </Fact>
        <Fact label={home.leads.length === 1 ? 'Lead' : 'Leads'}>
          {home.leads.map((lead) => lead.name).join(', ') || '—'}
        </Fact>
        <Fact label="Opened">
          {formatDate(detail.createdAt)}
          <span className="ml-2 font-mono text-xs text-ink-muted" title="Control-number prefix">
            {detail.controlPrefix}
          </span>
        </Fact>
      </dl>
      <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_19rem]">
        <section aria-labelledby="sections-heading">
          <h2 id="sections-heading" className="mb-2 text-sm font-semibold text-ink">
            Sections
          </h2>
          {sections.length === 0 ? (
            <p className="text-sm text-ink-muted">
              The sections you may use appear here as the matter's documents arrive.
            </p>
          ) : (
            <ul className="divide-y divide-line rounded-md border border-line bg-panel">
              {sections.map((section) => (
                <li key={section.id}>
                  <Link
                    to={matterSectionHref(detail.id, section)}
                    className="group flex items-baseline gap-4 px-4 py-2.5 hover:bg-paper"
                    data-testid={`matter-home-link-${section.id}`}
                  >
                    <span className="w-36 shrink-0 font-medium text-accent-strong group-hover:underline">
                      {section.label}
                    </span>
                    <span className="text-sm text-ink-muted">{section.summary}</span>
                    <span
                      aria-hidden="true"
                      className="ml-auto text-ink-faint group-hover:text-accent"
                    >
                      →
                    </span>
                  </Link>
                </li>
              ))}
            </ul>
          )}
        </section>
        <aside
          aria-labelledby="role-heading"
          className="rounded-md border border-line bg-panel px-4 py-3"
        >
          <h2 id="role-heading" className="text-sm font-semibold">
            Your role: {ROLE_LABELS[role]}
          </h2>
          <p className="text-[13px] text-ink-muted">On this matter you may:</p>
          <ul className="mt-2 grid gap-x-3 gap-y-0.5 text-[13px]" data-testid="role-permissions">
            {permissions.map((permission) => (
              <li key={permission} className="flex gap-2">
                <span aria-hidden="true" className="text-ok">
                  ✓
                </span>
                {PERMISSION_LABELS[permission]}
              </li>
            ))}
          </ul>
        </aside>
      </div>
      <ReviewCaution className="mt-8" />
    </div>
  );
}

function Fact({
  label,
  children,
  testId,
}: {
  label: string;
  children: ReactNode;
  testId?: string;
}) {
  return (
    <div className="px-4 py-2.5">
      <dt className="text-[11px] font-semibold tracking-wider text-ink-faint uppercase">{label}</dt>
      <dd className="mt-0.5 truncate text-[15px] font-medium tabular-nums" data-testid={testId}>
        {children}
      </dd>
    </div>
  );
}
