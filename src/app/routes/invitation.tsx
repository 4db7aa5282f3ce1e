import { type FormEvent, useState } from 'react';
import { Link, useNavigate, useParams } from 'react-router-dom';
import { NAME_MAX_LENGTH, PASSWORD_MAX_LENGTH, PASSWORD_MIN_LENGTH } from '@shared/limits';
import { ROLE_LABELS } from '@shared/roles';
import { PublicLayout } from '@/components/layout/public-layout';
import {
  Button,
  ErrorPanel,
  LoadingBlock,
  Notice,
  TextField,
  describeError,
} from '@/components/ui';
import { useAcceptInvitation } from '@/features/invitations/api/accept-invitation';
import { useMe } from '@/features/auth/api/get-me';
import { checkNewPassword } from '@/features/auth/new-password-check';
import {
  type InvitationPreviewResponse,
  useInvitation,
} from '@/features/invitations/api/get-invitation';
import { isApiError } from '@/lib/api-client';
import { formatDateTime } from '@/lib/format';

/** /invitations/:token — create an account (name + password) or link an existing one. */
export function InvitationRoute() {
  const token = useParams().token ?? '';
  const invitation = useInvitation(token);
  return (
    <PublicLayout>
      {invitation.isPending ? (
        <LoadingBlock label="Checking the invitation…" />
      ) : invitation.isError ? (
        <InvitationProblem error={invitation.error} onRetry={() => void invitation.refetch()} />
      ) : (
        <AcceptForm token={token} invitation={invitation.data} />
      )}
    </PublicLayout>
  );
}

function InvitationProblem({ error, onRetry }: { error: unknown; onRetry: () => void }) {
  const final = isApiError(error) && error.isClientError;
  return (
    <div className="space-y-4">
      <h1 className="text-xl font-semibold tracking-tight">This invitation cannot be used</h1>
      {final ? (
        <Notice tone="danger" title="Invitation not valid">
          {error.message} Ask the matter lead to send a new one.
        </Notice>
      ) : (
        <ErrorPanel error={error} onRetry={onRetry} />
      )}
      <Link
        to="/sign-in"
        className="text-sm font-medium text-accent-strong underline underline-offset-2"
      >
        Go to sign-in
      </Link>
    </div>
  );
}

function AcceptForm({
  token,
  invitation,
}: {
  token: string;
  invitation: InvitationPreviewResponse;
}) {
  const accept = useAcceptInvitation(token);
  const navigate = useNavigate();
  // Already signed in as the invited account: accepting needs no password.
  const me = useMe();
  const signedInAsInvitee = me.data?.user.email.toLowerCase() === invitation.email.toLowerCase();
  const [mode, setMode] = useState<'create' | 'link'>(invitation.accountExists ? 'link' : 'create');
  const [name, setName] = useState('');
  const [password, setPassword] = useState('');
  const [repeat, setRepeat] = useState('');
  const [localError, setLocalError] = useState<string | null>(null);

  async function submit(event: FormEvent) {
    event.preventDefault();
    if (!signedInAsInvitee && mode === 'create') {
      if (!name.trim()) return setLocalError('Enter your name.');
      const problem = await checkNewPassword(password, { email: invitation.email, name });
      if (problem) return setLocalError(problem);
      if (password !== repeat) return setLocalError('The two passwords differ.');
    }
    setLocalError(null);
    accept.mutate(
      signedInAsInvitee ? {} : mode === 'create' ? { name: name.trim(), password } : { password },
      // Accepting signs this browser in as the invited account.
      { onSuccess: (result) => void navigate(`/matters/${result.matterId}`, { replace: true }) },
    );
  }

  const problems = (
    <>
      {localError ? <Notice tone="danger">{localError}</Notice> : null}
      {accept.isError ? (
        <Notice tone="danger" title="Not accepted">
          {describeError(accept.error)}
        </Notice>
      ) : null}
    </>
  );

  return (
    <div data-testid="invitation-page">
      <h1 className="text-xl font-semibold tracking-tight">Join {invitation.matterName}</h1>
      <p className="mt-1 text-sm text-ink-muted">
        {invitation.invitedBy ?? 'The matter lead'} invited{' '}
        <strong className="text-ink">{invitation.email}</strong> as{' '}
        <strong className="text-ink">{ROLE_LABELS[invitation.role]}</strong>. The link works once
        and expires {formatDateTime(invitation.expiresAt)}.
      </p>
      {signedInAsInvitee ? (
        <form
          onSubmit={(event) => void submit(event)}
          className="mt-5 space-y-4 rounded-lg border border-line bg-panel p-5"
          data-testid="accept-form"
        >
          <p className="text-sm">You are signed in as {invitation.email}.</p>
          {problems}
          <Button type="submit" variant="primary" className="w-full" busy={accept.isPending}>
            Join the matter
          </Button>
        </form>
      ) : (
        <>
          <fieldset className="mt-5 grid grid-cols-2 gap-1 rounded-md border border-line bg-sunk p-1 text-sm">
            <legend className="sr-only">How to accept</legend>
            {(['create', 'link'] as const).map((value) => (
              <label
                key={value}
                className={
                  'cursor-pointer rounded px-3 py-1.5 text-center has-[:focus-visible]:outline-2 has-[:focus-visible]:outline-focus ' +
                  (mode === value
                    ? 'bg-panel font-medium shadow-sm'
                    : 'text-ink-muted hover:text-ink')
                }
              >
                <input
                  type="radio"
                  name="accept-mode"
                  value={value}
                  className="sr-only"
                  checked={mode === value}
                  onChange={() => {
                    setMode(value);
                    accept.reset();
                    setLocalError(null);
                  }}
                />
                {value === 'create' ? 'Create my account' : 'I already have an account'}
              </label>
            ))}
          </fieldset>
          <form
            onSubmit={(event) => void submit(event)}
            className="mt-4 space-y-4 rounded-lg border border-line bg-panel p-5"
            noValidate
            data-testid="accept-form"
          >
            {mode === 'create' ? (
              <>
                <TextField
                  label="Your name"
                  autoComplete="name"
                  maxLength={NAME_MAX_LENGTH}
                  value={name}
                  onChange={(e) => setName(e.target.value)}
                />
                <TextField
                  label="Choose a password"
                  type="password"
                  autoComplete="new-password"
                  hint={`At least ${PASSWORD_MIN_LENGTH} characters.`}
                  maxLength={PASSWORD_MAX_LENGTH}
                  value={password}
                  onChange={(e) => setPassword(e.target.value)}
                />
                <TextField
                  label="Repeat the password"
                  type="password"
                  autoComplete="new-password"
                  value={repeat}
                  onChange={(e) => setRepeat(e.target.value)}
                />
              </>
            ) : (
              <TextField
                label={`Password of ${invitation.email}`}
                type="password"
                autoComplete="current-password"
                value={password}
                onChange={(e) => setPassword(e.target.value)}
              />
            )}
            {problems}
            <Button type="submit" variant="primary" className="w-full" busy={accept.isPending}>
              {mode === 'create' ? 'Create account and join' : 'Link my account and join'}
            </Button>
          </form>
        </>
      )}
    </div>
  );
}
