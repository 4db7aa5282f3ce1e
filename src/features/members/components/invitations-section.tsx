import { ROLE_LABELS } from '@shared/roles';
import {
  Badge,
  Button,
  Notice,
  QueryBoundary,
  TBody,
  THead,
  Table,
  Td,
  Th,
  Tr,
  describeError,
} from '@/components/ui';
import { useMembers } from '@/features/members/api/get-members';
import { useRevokeInvitation } from '@/features/members/api/revoke-invitation';
import { useMatterPermission } from '@/lib/authorization';
import { formatDateTime } from '@/lib/format';

export function InvitationsSection({ matterId }: { matterId: number }) {
  const invitations = useMembers(matterId);
  const canManage = useMatterPermission('members.manage');
  const revoke = useRevokeInvitation(matterId);
  return (
    <section aria-labelledby="invitations-heading">
      <h2 id="invitations-heading" className="mb-2 text-sm font-semibold">
        Pending invitations
      </h2>
      {revoke.isError ? (
        <Notice tone="danger" className="mb-2" title="The invitation was not revoked">
          {describeError(revoke.error)}
        </Notice>
      ) : null}
      <QueryBoundary query={invitations} errorTitle="Invitations could not be loaded">
        {({ invitations: list }) =>
          list.length === 0 ? (
            <p className="rounded-md border border-dashed border-line-strong px-4 py-3 text-sm text-ink-muted">
              No pending invitations. Invitations appear here until they are accepted, revoked or
              expire.
            </p>
          ) : (
            <Table caption="Invitations not yet accepted" data-testid="invitations-table">
              <THead>
                <tr>
                  <Th>E-mail</Th>
                  <Th className="w-40">Role</Th>
                  <Th className="w-44">Sent</Th>
                  <Th className="w-44">Expires</Th>
                  {canManage ? <Th className="w-28 text-right">Link</Th> : null}
                </tr>
              </THead>
              <TBody>
                {list.map((invitation) => (
                  <Tr key={invitation.id} data-testid={`invitation-row-${invitation.email}`}>
                    <Td>{invitation.email}</Td>
                    <Td>
                      <Badge>{ROLE_LABELS[invitation.role]}</Badge>
                    </Td>
                    <Td className="text-ink-muted">{formatDateTime(invitation.createdAt)}</Td>
                    <Td className="text-ink-muted">{formatDateTime(invitation.expiresAt)}</Td>
                    {canManage ? (
                      <Td className="text-right">
                        <Button
                          size="sm"
                          variant="danger"
                          busy={revoke.isPending && revoke.variables === invitation.id}
                          onClick={() => revoke.mutate(invitation.id)}
                          aria-label={`Revoke the invitation to ${invitation.email}`}
                        >
                          Revoke
                        </Button>
                      </Td>
                    ) : null}
                  </Tr>
                ))}
              </TBody>
            </Table>
          )
        }
      </QueryBoundary>
    </section>
  );
}
