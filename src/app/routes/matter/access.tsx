import type { QueryClient } from '@tanstack/react-query';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { Notice, PageHeader } from '@/components/ui';
import { membersQueryOptions } from '@/features/members/api/get-members';
import { Can, useMatterPermission } from '@/lib/authorization';
import { InvitationsSection } from '@/features/members/components/invitations-section';
import { GrantExistingForm, InviteForm } from '@/features/members/components/member-forms';
import { MembersSection } from '@/features/members/components/members-section';
import { parseMatterId, useMatterId } from './layout';

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ params }: LoaderFunctionArgs) => {
    const matterId = parseMatterId(params.matterId);
    if (Number.isNaN(matterId)) return null;
    void queryClient.prefetchQuery(membersQueryOptions(matterId));
    return null;
  };

export function AccessRoute() {
  const matterId = useMatterId();
  const canView = useMatterPermission('members.view');
  if (!canView) {
    return (
      <Notice tone="warn" title="Not available to your role">
        Only the matter lead manages access.
      </Notice>
    );
  }
  return (
    <div data-testid="access-page">
      <PageHeader
        title="Access"
        description="Who may work on this matter and in which role. A change takes effect on the person's very next request."
      />
      <Can permission="members.manage">
        <InviteForm matterId={matterId} />
        <GrantExistingForm matterId={matterId} />
      </Can>
      <MembersSection matterId={matterId} />
      <InvitationsSection matterId={matterId} />
    </div>
  );
}
