import { type FormEvent, useState } from 'react';
import {
  EMAIL_MAX_LENGTH,
  INVITATION_TTL_DAYS,
  NAME_MAX_LENGTH,
  PASSWORD_MIN_LENGTH,
} from '@shared/limits';
import type { CreateUserResponse } from '@shared/schemas/admin';
import {
  Badge,
  Button,
  Dialog,
  Notice,
  QueryBoundary,
  TBody,
  THead,
  Table,
  Td,
  TextField,
  Th,
  Tr,
  describeError,
} from '@/components/ui';
import { useCreateUser } from '@/features/admin/api/create-user';
import { useUsers } from '@/features/admin/api/get-users';
import { fieldErrorOf, isApiError } from '@/lib/api-client';
import { formatDate } from '@/lib/format';

export function AccountsSection() {
  const accounts = useUsers();
  const [creating, setCreating] = useState(false);
  const [created, setCreated] = useState<CreateUserResponse | null>(null);
  return (
    <section aria-labelledby="admin-accounts-heading">
      <div className="mb-2 flex items-center justify-between">
        <h2 id="admin-accounts-heading" className="text-sm font-semibold">
          Accounts
        </h2>
        <Button
          size="sm"
          variant="primary"
          onClick={() => {
            setCreated(null);
            setCreating(true);
          }}
        >
          New account
        </Button>
      </div>
      {created ? (
        <div data-testid="account-created" className="mb-2">
          <Notice tone="ok">
            {created.setupLinkSent ? (
              <>
                Account created. A set-up link was e-mailed to <strong>{created.user.email}</strong>
                .
              </>
            ) : (
              <>
                Account created for <strong>{created.user.email}</strong>. Give them the temporary
                password by a separate channel.
              </>
            )}
          </Notice>
        </div>
      ) : null}
      <QueryBoundary query={accounts} errorTitle="Accounts could not be loaded">
        {({ users: list }) => (
          <Table caption="All accounts of the firm" data-testid="admin-accounts-table">
            <THead>
              <tr>
                <Th>Name</Th>
                <Th>E-mail</Th>
                <Th className="w-32">Kind</Th>
                <Th className="w-24">Matters</Th>
                <Th className="w-32">Created</Th>
              </tr>
            </THead>
            <TBody>
              {list.map((account) => (
                <Tr key={account.id}>
                  <Td className="font-medium">{account.name}</Td>
                  <Td className="text-ink-muted">{account.email}</Td>
                  <Td>
                    {account.isAdmin ? <Badge tone="info">Firm admin</Badge> : null}
                    {account.disabled ? <Badge tone="danger">Disabled</Badge> : null}
                    {!account.isAdmin && !account.disabled ? (
                      <span className="text-ink-muted">Member</span>
                    ) : null}
                  </Td>
                  <Td className="tabular-nums">{account.matterCount}</Td>
                  <Td className="text-ink-muted">{formatDate(account.createdAt)}</Td>
                </Tr>
              ))}
            </TBody>
          </Table>
        )}
      </QueryBoundary>
      <CreateAccountDialog
        open={creating}
        onClose={() => setCreating(false)}
        onCreated={setCreated}
      />
    </section>
  );
}

type FirstPasswordMode = 'setup-link' | 'temporary-password';

const FIRST_PASSWORD_MODES: { value: FirstPasswordMode; label: string }[] = [
  { value: 'setup-link', label: 'E-mail a set-up link' },
  { value: 'temporary-password', label: 'Set a temporary password' },
];

function CreateAccountDialog({
  open,
  onClose,
  onCreated,
}: {
  open: boolean;
  onClose: () => void;
  onCreated: (result: CreateUserResponse) => void;
}) {
  const create = useCreateUser();
  const [email, setEmail] = useState('');
  const [name, setName] = useState('');
  const [mode, setMode] = useState<FirstPasswordMode>('setup-link');
  const [password, setPassword] = useState('');
  const [isAdmin, setIsAdmin] = useState(false);
  const close = () => {
    create.reset();
    setEmail('');
    setName('');
    setMode('setup-link');
    setPassword('');
    setIsAdmin(false);
    onClose();
  };
  function submit(event: FormEvent) {
    event.preventDefault();
    create.mutate(
      {
        email: email.trim(),
        name: name.trim(),
        isAdmin,
        // Without a temporary password the server e-mails a one-time set-up link.
        ...(mode === 'temporary-password' ? { temporaryPassword: password } : {}),
      },
      {
        onSuccess: (result) => {
          onCreated(result);
          close();
        },
      },
    );
  }
  const error = create.error;
  return (
    <Dialog
      open={open}
      onClose={close}
      title="New account"
      description="The person either chooses their own password through a one-time link sent to this e-mail address, or receives a temporary password from you by a separate channel."
    >
      <form onSubmit={submit} className="space-y-3" noValidate data-testid="create-account-form">
        <TextField
          label="Name"
          required
          maxLength={NAME_MAX_LENGTH}
          value={name}
          onChange={(e) => setName(e.target.value)}
          error={fieldErrorOf(error, 'name')}
        />
        <TextField
          label="E-mail"
          type="email"
          required
          maxLength={EMAIL_MAX_LENGTH}
          value={email}
          onChange={(e) => setEmail(e.target.value)}
          error={fieldErrorOf(error, 'email')}
        />
        <fieldset className="space-y-1.5">
          <legend className="text-[13px] font-medium text-ink">First password</legend>
          {FIRST_PASSWORD_MODES.map((option) => (
            <label key={option.value} className="flex items-center gap-2 text-sm">
              <input
                type="radio"
                name="first-password-mode"
                value={option.value}
                className="size-4 accent-accent"
                checked={mode === option.value}
                onChange={() => {
                  setMode(option.value);
                  create.reset();
                }}
              />
              {option.label}
            </label>
          ))}
        </fieldset>
        {mode === 'setup-link' ? (
          <p className="text-xs text-ink-muted">
            The link works once and expires after {INVITATION_TTL_DAYS} days (the default lifetime).
            Until it is used, nobody knows the account's password.
          </p>
        ) : (
          <TextField
            label="Temporary password"
            type="password"
            autoComplete="new-password"
            hint={`At least ${PASSWORD_MIN_LENGTH} characters. They can change it on My account.`}
            value={password}
            onChange={(e) => setPassword(e.target.value)}
            error={fieldErrorOf(error, 'temporaryPassword')}
          />
        )}
        <label className="flex items-center gap-2 text-sm">
          <input
            type="checkbox"
            className="size-4 accent-accent"
            checked={isAdmin}
            onChange={(e) => setIsAdmin(e.target.checked)}
          />
          Firm admin (creates accounts and matters; sees no documents unless a member)
        </label>
        {error && !(isApiError(error) && error.field) ? (
          <Notice tone="danger">{describeError(error)}</Notice>
        ) : null}
        <div className="flex justify-end gap-2 pt-1">
          <Button onClick={close}>Cancel</Button>
          <Button type="submit" variant="primary" busy={create.isPending}>
            {mode === 'setup-link' ? 'Create and send link' : 'Create account'}
          </Button>
        </div>
      </form>
    </Dialog>
  );
}
