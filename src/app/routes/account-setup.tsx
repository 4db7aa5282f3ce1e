import { type FormEvent, useState } from 'react';
import { Link, useNavigate, useParams } from 'react-router-dom';
import { PASSWORD_MAX_LENGTH, PASSWORD_MIN_LENGTH } from '@shared/limits';
import { PublicLayout } from '@/components/layout/public-layout';
import {
  Button,
  ErrorPanel,
  LoadingBlock,
  Notice,
  TextField,
  describeError,
} from '@/components/ui';
import { useCompleteAccountSetup } from '@/features/account-setup/api/complete-account-setup';
import { checkNewPassword } from '@/features/auth/new-password-check';
import {
  type AccountSetupPreviewResponse,
  useAccountSetup,
} from '@/features/account-setup/api/get-account-setup';
import { fieldErrorOf, isApiError } from '@/lib/api-client';
import { formatDateTime } from '@/lib/format';

/**
 * /account-setup/:token: the holder of a new account, created by a firm admin, chooses
 * the password. The server signs the browser in on success, so the page goes on to the
 * person's matters.
 */
export function AccountSetupRoute() {
  const token = useParams().token ?? '';
  const setup = useAccountSetup(token);
  return (
    <PublicLayout>
      {setup.isPending ? (
        <LoadingBlock label="Checking the set-up link…" />
      ) : setup.isError ? (
        <SetupLinkProblem error={setup.error} onRetry={() => void setup.refetch()} />
      ) : (
        <ChoosePasswordForm token={token} setup={setup.data} />
      )}
    </PublicLayout>
  );
}

/** Words for the refusals the server gives a link (shared with invitation links). */
function linkProblemText(error: unknown): { title: string; body: string } | null {
  if (!isApiError(error)) return null;
  switch (error.code) {
    case 'invitation_used':
      return {
        title: 'This link has already been used',
        body: 'The password of this account was chosen with it. Sign in with that password, or ask a firm administrator for a new link.',
      };
    case 'invitation_expired':
      return {
        title: 'This link has expired',
        body: 'Set-up links are valid for a limited time. Ask a firm administrator to send you a new one.',
      };
    case 'not_found':
    case 'validation_failed':
      return {
        title: 'This link is not valid',
        body: 'Check that the whole address from the e-mail was opened, or ask a firm administrator for a new link.',
      };
    default:
      return error.isClientError
        ? { title: 'This link cannot be used', body: error.message }
        : null;
  }
}

function SetupLinkProblem({ error, onRetry }: { error: unknown; onRetry: () => void }) {
  const problem = linkProblemText(error);
  return (
    <div className="space-y-4" data-testid="account-setup-problem">
      <h1 className="text-xl font-semibold tracking-tight">
        {problem ? problem.title : 'The set-up link could not be checked'}
      </h1>
      {problem ? (
        <Notice tone="danger">{problem.body}</Notice>
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

function ChoosePasswordForm({
  token,
  setup,
}: {
  token: string;
  setup: AccountSetupPreviewResponse;
}) {
  const complete = useCompleteAccountSetup(token);
  const navigate = useNavigate();
  const [password, setPassword] = useState('');
  const [repeat, setRepeat] = useState('');
  const [passwordProblem, setPasswordProblem] = useState<string | null>(null);
  const [repeatProblem, setRepeatProblem] = useState<string | null>(null);

  async function submit(event: FormEvent) {
    event.preventDefault();
    const problem = await checkNewPassword(password, { email: setup.email, name: setup.name });
    setPasswordProblem(problem);
    setRepeatProblem(!problem && password !== repeat ? 'The two passwords differ.' : null);
    if (problem || password !== repeat) return;
    complete.mutate(
      { password },
      { onSuccess: () => void navigate('/matters', { replace: true }) },
    );
  }

  // A link used (in another tab) or expired while the form was open gets the same words.
  const linkProblem = complete.isError ? linkProblemText(complete.error) : null;
  const serverPasswordError = fieldErrorOf(complete.error, 'password');
  return (
    <div data-testid="account-setup-page">
      <h1 className="text-xl font-semibold tracking-tight">Set up your Quarry account</h1>
      <p className="mt-1 text-sm text-ink-muted">
        A firm administrator created an account for{' '}
        {setup.name ? <strong className="text-ink">{setup.name}</strong> : null}
        {setup.name ? ' ' : null}
        <span data-testid="account-setup-email">
          (<strong className="text-ink">{setup.email}</strong>)
        </span>
        . Choose the password you will sign in with. The link works once and expires{' '}
        {formatDateTime(setup.expiresAt)}.
      </p>
      <form
        onSubmit={(event) => void submit(event)}
        className="mt-5 space-y-4 rounded-lg border border-line bg-panel p-5"
        noValidate
        data-testid="account-setup-form"
      >
        {/* Lets password managers store the new password under the right account. */}
        <input
          type="email"
          name="username"
          autoComplete="username"
          value={setup.email}
          readOnly
          hidden
        />
        <TextField
          label="Choose a password"
          type="password"
          name="new-password"
          autoComplete="new-password"
          autoFocus
          hint={`At least ${PASSWORD_MIN_LENGTH} characters; a few unrelated words work well.`}
          maxLength={PASSWORD_MAX_LENGTH}
          value={password}
          error={passwordProblem ?? serverPasswordError}
          onChange={(e) => setPassword(e.target.value)}
        />
        <TextField
          label="Repeat the password"
          type="password"
          name="repeat-password"
          autoComplete="new-password"
          maxLength={PASSWORD_MAX_LENGTH}
          value={repeat}
          error={repeatProblem}
          onChange={(e) => setRepeat(e.target.value)}
        />
        {complete.isError && !serverPasswordError ? (
          <Notice tone="danger" title={linkProblem?.title ?? 'The password was not set'}>
            {linkProblem?.body ?? describeError(complete.error)}
          </Notice>
        ) : null}
        <Button type="submit" variant="primary" className="w-full" busy={complete.isPending}>
          Set password and sign in
        </Button>
      </form>
    </div>
  );
}
