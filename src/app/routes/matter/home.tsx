import { Link } from 'react-router';
import { ROLE_LABELS, permissionsOf } from '../../../../shared/roles';
import { ReviewCaution } from '../../../components/review-caution';
import { PageHeader } from '../../../components/ui';
import { useMatter } from '../../../features/matters/api/get-matter';
import { MATTER_SECTIONS, matterSectionHref } from '../../../features/matters/matter-sections';
import { useMatterRole } from '../../../lib/authorization';
import { formatDate } from '../../../lib/format';
import { PERMISSION_LABELS } from '../../../lib/permission-labels';
import { roleCan } from '../../../../shared/roles';
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
        eyebrow={<span className="font-mono">{detail.controlPrefix}</span>}
        title={detail.name}
        description={detail.description || undefined}
      />
      <div className="grid gap-5 lg:grid-cols-[minmax(0,1fr)_20rem]">
        <section aria-labelledby="sections-heading">
          <h2 id="sections-heading" className="mb-2 text-sm font-semibold text-ink">
            Sections
          </h2>
          {sections.length === 0 ? (
            <p className="text-sm text-ink-muted">
              More sections open here as the matter's documents arrive.
            </p>
          ) : (
            <ul className="divide-y divide-line rounded-md border border-line bg-panel">
              {sections.map((section) => (
                <li key={section.id}>
                  <Link
                    to={matterSectionHref(detail.id, section)}
                    className="group flex items-baseline gap-4 px-4 py-3 hover:bg-paper"
                    data-testid={`matter-home-link-${section.id}`}
                  >
                    <span className="w-36 shrink-0 font-medium text-accent-strong group-hover:underline">
                      {section.label}
                    </span>
                    <span className="text-sm text-ink-muted">{section.summary}</span>
                  </Link>
                </li>
              ))}
            </ul>
          )}
          <dl className="mt-5 grid grid-cols-[9rem_1fr] gap-y-1 text-sm">
            <dt className="text-ink-muted">Control prefix</dt>
            <dd className="font-mono">{detail.controlPrefix}</dd>
            <dt className="text-ink-muted">Opened</dt>
            <dd>{formatDate(detail.createdAt)}</dd>
            <dt className="text-ink-muted">{home.leads.length === 1 ? 'Lead' : 'Leads'}</dt>
            <dd>{home.leads.map((lead) => lead.name).join(', ') || '—'}</dd>
            <dt className="text-ink-muted">Team</dt>
            <dd className="tabular-nums" data-testid="matter-member-count">
              {home.memberCount} {home.memberCount === 1 ? 'member' : 'members'}
            </dd>
            <dt className="text-ink-muted">Documents</dt>
            <dd className="tabular-nums" data-testid="matter-document-count">
              {home.documentCount.toLocaleString()}
            </dd>
          </dl>
        </section>
        <aside
          aria-labelledby="role-heading"
          className="rounded-md border border-line bg-panel p-4"
        >
          <h2 id="role-heading" className="text-sm font-semibold">
            Your role: {ROLE_LABELS[role]}
          </h2>
          <p className="mt-0.5 text-[13px] text-ink-muted">On this matter you may:</p>
          <ul className="mt-2 space-y-1 text-[13px]" data-testid="role-permissions">
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
      <ReviewCaution className="mt-6" />
    </div>
  );
}
