import type { QueryClient } from '@tanstack/react-query';
import { type FormEvent, useState } from 'react';
import {
  CONTROL_PREFIX_PATTERN,
  EMAIL_MAX_LENGTH,
  INVITATION_TTL_DAYS,
  MATTER_NAME_MAX_LENGTH,
  NAME_MAX_LENGTH,
  PASSWORD_MIN_LENGTH,
} from '@shared/limits';
import type { CreateUserResponse } from '@shared/schemas/admin';
import {
  Badge,
  Button,
  Dialog,
  EmptyState,
  Notice,
  PageHeader,
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
import { useAppointLead } from '@/features/admin/api/appoint-lead';
import { useCreateUser } from '@/features/admin/api/create-user';
import { useCreateMatter } from '@/features/admin/api/create-matter';
import { usersQueryOptions, useUsers } from '@/features/admin/api/get-users';
import {
  type AdminMatter,
  adminMattersQueryOptions,
  useAdminMatters,
} from '@/features/admin/api/get-admin-matters';
import { useMe } from '@/features/auth/api/get-me';
import { fieldErrorOf, isApiError } from '@/lib/api-client';
import { formatDate } from '@/lib/format';

export const clientLoader = (queryClient: QueryClient) => async () => {
  void queryClient.prefetchQuery(usersQueryOptions());
  void queryClient.prefetchQuery(adminMattersQueryOptions());
  return null;
};

export function AdminRoute() {
  const me = useMe();
  if (me.data && !me.data.user.isAdmin) {
    return (
      <main className="mx-auto max-w-[88rem] px-4 py-6">
        <Notice tone="warn" title="Firm admins only">
          This page is for the firm's administrators, who create accounts and matters.
        </Notice>
      </main>
    );
  }
  return (
    <main className="mx-auto max-w-[88rem] px-4 py-6" data-testid="admin-page">
      <PageHeader
        title="Firm admin"
        description="Create accounts and matters and appoint each matter's lead. Admins see no documents unless they are also members of a matter."
      />
      <div className="space-y-8">
        <MattersSection />
        <AccountsSection />
      </div>
    </main>
  );
}

const fieldError = fieldErrorOf;

function MattersSection() {
  const matters = useAdminMatters();
  const [creating, setCreating] = useState(false);
  const [appointing, setAppointing] = useState<AdminMatter | null>(null);
  return (
    <section aria-labelledby="admin-matters-heading">
      <div className="mb-2 flex items-center justify-between">
        <h2 id="admin-matters-heading" className="text-sm font-semibold">
          Matters
        </h2>
        <Button size="sm" variant="primary" onClick={() => setCreating(true)}>
          New matter
        </Button>
      </div>
      <QueryBoundary query={matters} errorTitle="Matters could not be loaded">
        {({ matters: list }) =>
          list.length === 0 ? (
            <EmptyState title="No matters yet" />
          ) : (
            <Table caption="All matters of the firm" data-testid="admin-matters-table">
              <THead>
                <tr>
                  <Th>Matter</Th>
                  <Th className="w-28">Prefix</Th>
                  <Th>Lead</Th>
                  <Th className="w-24">Members</Th>
                  <Th className="w-32">Opened</Th>
                  <Th className="w-36 text-right">
                    <span className="sr-only">Actions</span>
                  </Th>
                </tr>
              </THead>
              <TBody>
                {list.map((matter) => (
                  <Tr key={matter.id}>
                    <Td className="font-medium">{matter.name}</Td>
                    <Td className="font-mono text-[13px] text-ink-muted">{matter.controlPrefix}</Td>
                    <Td>
                      {matter.leads.length === 0 ? (
                        <Badge tone="warn">No lead</Badge>
                      ) : (
                        matter.leads.map((lead) => lead.name).join(', ')
                      )}
                    </Td>
                    <Td className="tabular-nums">{matter.memberCount}</Td>
                    <Td className="text-ink-muted">{formatDate(matter.createdAt)}</Td>
                    <Td className="text-right">
                      <Button size="sm" onClick={() => setAppointing(matter)}>
                        Appoint lead
                      </Button>
                    </Td>
                  </Tr>
                ))}
              </TBody>
            </Table>
          )
        }
      </QueryBoundary>
      <CreateMatterDialog open={creating} onClose={() => setCreating(false)} />
      <AppointLeadDialog matter={appointing} onClose={() => setAppointing(null)} />
    </section>
  );
}

function CreateMatterDialog({ open, onClose }: { open: boolean; onClose: () => void }) {
  const create = useCreateMatter();
  const [name, setName] = useState('');
  const [description, setDescription] = useState('');
  const [controlPrefix, setPrefix] = useState('');
  const [leadEmail, setLeadEmail] = useState('');
  const prefixValid = CONTROL_PREFIX_PATTERN.test(controlPrefix);

  const close = () => {
    create.reset();
    setName('');
    setDescription('');
    setPrefix('');
    setLeadEmail('');
    onClose();
  };

  function submit(event: FormEvent) {
    event.preventDefault();
    create.mutate(
      {
        name: name.trim(),
        description: description.trim(),
        controlPrefix,
        lead: leadEmail.trim(),
      },
      { onSuccess: close },
    );
  }

  const error = create.error;
  return (
    <Dialog
      open={open}
      onClose={close}
      title="New matter"
      description="The control prefix starts every Bates-style control number of the matter's documents."
    >
      <form onSubmit={submit} className="space-y-3" noValidate>
        <TextField
          label="Name"
          required
          maxLength={MATTER_NAME_MAX_LENGTH}
          value={name}
          onChange={(e) => setName(e.target.value)}
          error={fieldError(error, 'name')}
        />
        <TextField
          label="Description"
          value={description}
          onChange={(e) => setDescription(e.target.value)}
          error={fieldError(error, 'description')}
        />
        <TextField
          label="Control prefix"
          hint="2–8 capital letters or digits, starting with a letter (e.g. HARB)."
          value={controlPrefix}
          onChange={(e) => setPrefix(e.target.value.toUpperCase())}
          error={
            controlPrefix && !prefixValid
              ? 'Use 2–8 capital letters or digits, starting with a letter.'
              : fieldError(error, 'controlPrefix')
          }
        />
        <TextField
          label="Lead's e-mail"
          hint="An existing account; it becomes the matter's first lead."
          required
          type="email"
          maxLength={EMAIL_MAX_LENGTH}
          value={leadEmail}
          onChange={(e) => setLeadEmail(e.target.value)}
          error={fieldError(error, 'lead')}
        />
        {error && !(isApiError(error) && error.field) ? (
          <Notice tone="danger">{describeError(error)}</Notice>
        ) : null}
        <div className="flex justify-end gap-2 pt-1">
          <Button onClick={close}>Cancel</Button>
          <Button
            type="submit"
            variant="primary"
            busy={create.isPending}
            disabled={!name.trim() || !prefixValid || !leadEmail.trim()}
          >
            Create matter
          </Button>
        </div>
      </form>
    </Dialog>
  );
}

function AppointLeadDialog({
  matter,
  onClose,
}: {
  matter: AdminMatter | null;
  onClose: () => void;
}) {
  const appoint = useAppointLead();
  const [email, setEmail] = useState('');
  const close = () => {
    appoint.reset();
    setEmail('');
    onClose();
  };
  function submit(event: FormEvent) {
    event.preventDefault();
    if (!matter) return;
    appoint.mutate({ matterId: matter.id, lead: email.trim() }, { onSuccess: close });
  }
  return (
    <Dialog
      open={matter !== null}
      onClose={close}
      title={matter ? `Appoint a lead for ${matter.name}` : 'Appoint lead'}
      description="The account becomes the matter's lead; it can then invite the team."
    >
      <form onSubmit={submit} className="space-y-3" noValidate>
        <TextField
          label="Account e-mail"
          type="email"
          required
          value={email}
          onChange={(e) => setEmail(e.target.value)}
          error={fieldError(appoint.error, 'lead')}
        />
        {appoint.error && !(isApiError(appoint.error) && appoint.error.field) ? (
          <Notice tone="danger">{describeError(appoint.error)}</Notice>
        ) : null}
        <div className="flex justify-end gap-2 pt-1">
          <Button onClick={close}>Cancel</Button>
          <Button type="submit" variant="primary" busy={appoint.isPending} disabled={!email.trim()}>
            Appoint lead
          </Button>
        </div>
      </form>
    </Dialog>
  );
}

function AccountsSection() {
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
          error={fieldError(error, 'name')}
        />
        <TextField
          label="E-mail"
          type="email"
          required
          maxLength={EMAIL_MAX_LENGTH}
          value={email}
          onChange={(e) => setEmail(e.target.value)}
          error={fieldError(error, 'email')}
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
            error={fieldError(error, 'temporaryPassword')}
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
