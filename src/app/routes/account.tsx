import { type FormEvent, useState } from 'react';
import { PASSWORD_MAX_LENGTH, PASSWORD_MIN_LENGTH } from '@shared/limits';
import {
  Button,
  Notice,
  PageHeader,
  QueryBoundary,
  TextField,
  describeError,
} from '@/components/ui';
import { useChangePassword } from '@/features/auth/api/change-password';
import { useMe } from '@/features/auth/api/get-me';
import { fieldErrorOf, isApiError } from '@/lib/api-client';
import { checkNewPassword } from '@/features/auth/new-password-check';

export function AccountRoute() {
  const me = useMe();
  return (
    <main className="mx-auto max-w-[88rem] px-4 py-6">
      <PageHeader title="My account" />
      {me.data?.passwordChangeRequired ? (
        <Notice tone="warn" title="Choose your own password" className="mb-4 max-w-4xl">
          A firm administrator set your current password. Choose a new one to continue; the
          temporary password stops working after a few days.
        </Notice>
      ) : null}
      <div className="grid max-w-4xl gap-6 md:grid-cols-2">
        <QueryBoundary query={me}>
          {({ user }) => (
            <section
              aria-labelledby="profile-heading"
              className="rounded-md border border-line bg-panel p-4"
            >
              <h2 id="profile-heading" className="text-sm font-semibold">
                Profile
              </h2>
              <dl className="mt-2 grid grid-cols-[7rem_1fr] gap-y-1 text-sm">
                <dt className="text-ink-muted">Name</dt>
                <dd>{user.name}</dd>
                <dt className="text-ink-muted">E-mail</dt>
                <dd>{user.email}</dd>
                <dt className="text-ink-muted">Firm admin</dt>
                <dd>{user.isAdmin ? 'Yes' : 'No'}</dd>
              </dl>
            </section>
          )}
        </QueryBoundary>
        <ChangePasswordForm />
      </div>
    </main>
  );
}

function ChangePasswordForm() {
  const change = useChangePassword();
  const me = useMe();
  const [currentPassword, setCurrent] = useState('');
  const [newPassword, setNew] = useState('');
  const [repeat, setRepeat] = useState('');
  const [localError, setLocalError] = useState<string | null>(null);

  async function submit(event: FormEvent) {
    event.preventDefault();
    const problem =
      newPassword.length < PASSWORD_MIN_LENGTH
        ? `Use at least ${PASSWORD_MIN_LENGTH} characters.`
        : newPassword === currentPassword
          ? 'The new password must differ from the current one.'
          : await checkNewPassword(newPassword, {
              email: me.data?.user.email,
              name: me.data?.user.name,
            });
    if (problem) {
      setLocalError(problem);
      return;
    }
    if (newPassword !== repeat) {
      setLocalError('The two new passwords differ.');
      return;
    }
    setLocalError(null);
    change.mutate(
      { currentPassword, newPassword },
      {
        // The server ends every other session and starts a fresh one for this browser.
        onSuccess: () => {
          setCurrent('');
          setNew('');
          setRepeat('');
        },
      },
    );
  }

  const serverField = isApiError(change.error) ? change.error.field : undefined;
  return (
    <section
      aria-labelledby="password-heading"
      className="rounded-md border border-line bg-panel p-4"
    >
      <h2 id="password-heading" className="text-sm font-semibold">
        Change password
      </h2>
      <p className="mt-0.5 text-[13px] text-ink-muted">
        Every session you have open, on any device, ends when the password changes.
      </p>
      <form
        onSubmit={(event) => void submit(event)}
        className="mt-3 space-y-3"
        noValidate
        data-testid="change-password-form"
      >
        <TextField
          label="Current password"
          type="password"
          autoComplete="current-password"
          value={currentPassword}
          onChange={(event) => setCurrent(event.target.value)}
          error={fieldErrorOf(change.error, 'currentPassword')}
        />
        <TextField
          label="New password"
          type="password"
          autoComplete="new-password"
          hint={`At least ${PASSWORD_MIN_LENGTH} characters; a passphrase of several words works well.`}
          minLength={PASSWORD_MIN_LENGTH}
          maxLength={PASSWORD_MAX_LENGTH}
          value={newPassword}
          onChange={(event) => setNew(event.target.value)}
          error={localError ?? fieldErrorOf(change.error, 'newPassword')}
        />
        <TextField
          label="Repeat the new password"
          type="password"
          autoComplete="new-password"
          value={repeat}
          onChange={(event) => setRepeat(event.target.value)}
        />
        {change.isError && serverField !== 'currentPassword' && serverField !== 'newPassword' ? (
          <Notice tone="danger">{describeError(change.error)}</Notice>
        ) : null}
        {change.isSuccess ? (
          <Notice tone="ok">
            Password changed. Every other session of this account has ended.
          </Notice>
        ) : null}
        <Button type="submit" variant="primary" busy={change.isPending}>
          Change password
        </Button>
      </form>
    </section>
  );
}
