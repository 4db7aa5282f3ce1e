import { useState } from 'react';
import { type MatterRole, ROLE_LABELS } from '@shared/roles';
import {
  Badge,
  Button,
  Dialog,
  Notice,
  QueryBoundary,
  Select,
  TBody,
  THead,
  Table,
  Td,
  Th,
  Tr,
  describeError,
} from '@/components/ui';
import { useMe } from '@/features/auth/api/get-me';
import { useChangeMemberRole } from '@/features/members/api/change-member-role';
import { type Member, useMembers } from '@/features/members/api/get-members';
import { useRevokeMember } from '@/features/members/api/revoke-member';
import { useMatterPermission } from '@/lib/authorization';
import { formatDate } from '@/lib/format';
import { roleOptions } from '../role-options';

export function MembersSection({ matterId }: { matterId: number }) {
  const members = useMembers(matterId);
  const me = useMe();
  const canManage = useMatterPermission('members.manage');
  const changeRole = useChangeMemberRole(matterId);
  const [revoking, setRevoking] = useState<Member | null>(null);

  return (
    <section aria-labelledby="members-heading" className="mb-6">
      <h2 id="members-heading" className="mb-2 text-sm font-semibold">
        Members
      </h2>
      {changeRole.isError ? (
        <Notice tone="danger" className="mb-2" title="The role was not changed">
          {describeError(changeRole.error)}
        </Notice>
      ) : null}
      <QueryBoundary query={members} errorTitle="Members could not be loaded">
        {({ members: list }) => (
          <Table caption="Members of this matter" data-testid="members-table">
            <THead>
              <tr>
                <Th>Name</Th>
                <Th>E-mail</Th>
                <Th className="w-48">Role</Th>
                <Th className="w-36">Since</Th>
                {canManage ? <Th className="w-28 text-right">Access</Th> : null}
              </tr>
            </THead>
            <TBody>
              {list.map((member) => {
                const isMe = member.userId === me.data?.user.id;
                return (
                  <Tr key={member.userId} data-testid={`member-row-${member.email}`}>
                    <Td className="font-medium">
                      {member.name}
                      {isMe ? (
                        <span className="ml-1.5 text-xs font-normal text-ink-muted">(you)</span>
                      ) : null}
                    </Td>
                    <Td className="text-ink-muted">{member.email}</Td>
                    <Td>
                      {canManage && !isMe ? (
                        <Select
                          aria-label={`Role of ${member.name}`}
                          options={roleOptions}
                          value={member.role}
                          disabled={changeRole.isPending}
                          onChange={(event) =>
                            changeRole.mutate({
                              userId: member.userId,
                              role: event.target.value as MatterRole,
                            })
                          }
                          compact
                          className="w-40"
                        />
                      ) : (
                        <Badge tone={member.role === 'lead' ? 'accent' : 'neutral'}>
                          {ROLE_LABELS[member.role]}
                        </Badge>
                      )}
                    </Td>
                    <Td className="text-ink-muted">{formatDate(member.grantedAt)}</Td>
                    {canManage ? (
                      <Td className="text-right">
                        {isMe ? null : (
                          <Button size="sm" variant="danger" onClick={() => setRevoking(member)}>
                            Revoke
                          </Button>
                        )}
                      </Td>
                    ) : null}
                  </Tr>
                );
              })}
            </TBody>
          </Table>
        )}
      </QueryBoundary>
      <RevokeMemberDialog matterId={matterId} member={revoking} onClose={() => setRevoking(null)} />
    </section>
  );
}

function RevokeMemberDialog({
  matterId,
  member,
  onClose,
}: {
  matterId: number;
  member: Member | null;
  onClose: () => void;
}) {
  const revoke = useRevokeMember(matterId);
  const close = () => {
    revoke.reset();
    onClose();
  };
  return (
    <Dialog
      open={member !== null}
      onClose={close}
      title={member ? `Revoke ${member.name}'s access?` : 'Revoke access'}
      description="They lose access to this matter on their next request. Their past work and the activity log stay."
    >
      {revoke.isError ? (
        <Notice tone="danger" className="mb-3">
          {describeError(revoke.error)}
        </Notice>
      ) : null}
      <div className="flex justify-end gap-2">
        <Button onClick={close}>Cancel</Button>
        <Button
          variant="danger"
          busy={revoke.isPending}
          onClick={() => member && revoke.mutate(member.userId, { onSuccess: close })}
        >
          Revoke access
        </Button>
      </div>
    </Dialog>
  );
}
