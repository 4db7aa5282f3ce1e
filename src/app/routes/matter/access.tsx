import type { QueryClient } from '@tanstack/react-query';
import { type FormEvent, useState } from 'react';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { MATTER_ROLES, type MatterRole, ROLE_LABELS } from '@shared/roles';
import { EMAIL_MAX_LENGTH } from '@shared/limits';
import {
  Badge,
  Button,
  Dialog,
  Notice,
  PageHeader,
  QueryBoundary,
  Select,
  TBody,
  THead,
  Table,
  Td,
  TextField,
  Th,
  Tr,
  describeError,
} from '@/components/ui';
import { useMe } from '@/features/auth/api/get-me';
import { useChangeMemberRole } from '@/features/members/api/change-member-role';
import { type Member, membersQueryOptions, useMembers } from '@/features/members/api/get-members';
import { useGrantMember } from '@/features/members/api/grant-member';
import { useInviteMember } from '@/features/members/api/invite-member';
import { useRevokeInvitation } from '@/features/members/api/revoke-invitation';
import { useRevokeMember } from '@/features/members/api/revoke-member';
import { fieldErrorOf } from '@/lib/api-client';
import { Can, useMatterPermission } from '@/lib/authorization';
import { formatDate, formatDateTime } from '@/lib/format';
import { parseMatterId, useMatterId } from './layout';

const roleOptions = MATTER_ROLES.map((role) => ({ value: role, label: ROLE_LABELS[role] }));

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

function InviteForm({ matterId }: { matterId: number }) {
  const invite = useInviteMember(matterId);
  const [email, setEmail] = useState('');
  const [role, setRole] = useState<MatterRole>('reviewer');
  const [sentTo, setSentTo] = useState<string | null>(null);

  function submit(event: FormEvent) {
    event.preventDefault();
    const address = email.trim();
    invite.mutate(
      { email: address, role },
      {
        onSuccess: () => {
          setSentTo(address);
          setEmail('');
        },
      },
    );
  }

  const fieldError = fieldErrorOf(invite.error, 'email');
  return (
    <section
      aria-labelledby="invite-heading"
      className="mb-6 rounded-md border border-line bg-panel p-4"
    >
      <h2 id="invite-heading" className="text-sm font-semibold">
        Invite by e-mail
      </h2>
      <p className="mt-0.5 text-[13px] text-ink-muted">
        The person receives a single-use link, valid for 7 days, to create an account or link an
        existing one.
      </p>
      <form
        onSubmit={submit}
        className="mt-3 flex flex-wrap items-end gap-3"
        data-testid="invite-form"
        noValidate
      >
        <TextField
          label="E-mail address"
          type="email"
          name="email"
          required
          maxLength={EMAIL_MAX_LENGTH}
          className="w-80"
          value={email}
          error={fieldError}
          onChange={(event) => setEmail(event.target.value)}
        />
        <Select
          label="Role"
          name="role"
          className="w-44"
          options={roleOptions}
          value={role}
          onChange={(event) => setRole(event.target.value as MatterRole)}
        />
        <Button type="submit" variant="primary" busy={invite.isPending}>
          Send invitation
        </Button>
      </form>
      {invite.isError && !fieldError ? (
        <Notice tone="danger" className="mt-3" title="The invitation was not sent">
          {describeError(invite.error)}
        </Notice>
      ) : null}
      {sentTo && invite.isSuccess ? (
        <Notice tone="ok" className="mt-3">
          Invitation sent to <strong>{sentTo}</strong>.
        </Notice>
      ) : null}
    </section>
  );
}

/** Gives an account that already exists a role at once, without the e-mail round trip. */
function GrantExistingForm({ matterId }: { matterId: number }) {
  const grant = useGrantMember(matterId);
  const [email, setEmail] = useState('');
  const [role, setRole] = useState<MatterRole>('reviewer');
  const [added, setAdded] = useState<{ name: string; role: MatterRole } | null>(null);

  function submit(event: FormEvent) {
    event.preventDefault();
    setAdded(null);
    grant.mutate(
      { email: email.trim(), role },
      {
        onSuccess: ({ member }) => {
          setAdded({ name: member.name || member.email, role: member.role });
          setEmail('');
        },
      },
    );
  }

  const emailError = fieldErrorOf(grant.error, 'email');
  const roleError = fieldErrorOf(grant.error, 'role');
  return (
    <section
      aria-labelledby="grant-heading"
      className="mb-6 rounded-md border border-line bg-panel p-4"
    >
      <h2 id="grant-heading" className="text-sm font-semibold">
        Add an existing account
      </h2>
      <p className="mt-0.5 text-[13px] text-ink-muted">
        For someone who already signs in to Quarry: the role applies at once, with no e-mail.
      </p>
      <form
        onSubmit={submit}
        className="mt-3 flex flex-wrap items-start gap-3"
        data-testid="grant-form"
        noValidate
      >
        <TextField
          label="Account e-mail"
          type="email"
          name="account-email"
          required
          maxLength={EMAIL_MAX_LENGTH}
          className="w-80"
          value={email}
          error={emailError}
          onChange={(event) => {
            setEmail(event.target.value);
            if (grant.isError) grant.reset();
          }}
        />
        <Select
          label="Role"
          name="grant-role"
          className="w-44"
          options={roleOptions}
          value={role}
          error={roleError}
          onChange={(event) => setRole(event.target.value as MatterRole)}
        />
        {/* A label-high spacer keeps the button level with the inputs when an error shows. */}
        <div className="space-y-1">
          <span aria-hidden="true" className="block text-[13px] font-medium">
            &nbsp;
          </span>
          <Button type="submit" busy={grant.isPending} disabled={!email.trim()}>
            Add to matter
          </Button>
        </div>
      </form>
      {grant.isError && !emailError && !roleError ? (
        <Notice tone="danger" className="mt-3" title="The account was not added">
          {describeError(grant.error)}
        </Notice>
      ) : null}
      {added && grant.isSuccess ? (
        <Notice tone="ok" className="mt-3">
          <strong>{added.name}</strong> now has the role {ROLE_LABELS[added.role]}.
        </Notice>
      ) : null}
    </section>
  );
}

function MembersSection({ matterId }: { matterId: number }) {
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

function InvitationsSection({ matterId }: { matterId: number }) {
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
