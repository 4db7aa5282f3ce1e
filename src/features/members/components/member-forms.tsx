import { type FormEvent, useState } from 'react';
import { type MatterRole, ROLE_LABELS } from '@shared/roles';
import { EMAIL_MAX_LENGTH } from '@shared/limits';
import { Button, Notice, Select, TextField, describeError } from '@/components/ui';
import { useGrantMember } from '@/features/members/api/grant-member';
import { useInviteMember } from '@/features/members/api/invite-member';
import { fieldErrorOf } from '@/lib/api-client';
import { roleOptions } from '../role-options';

export function InviteForm({ matterId }: { matterId: number }) {
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
export function GrantExistingForm({ matterId }: { matterId: number }) {
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
