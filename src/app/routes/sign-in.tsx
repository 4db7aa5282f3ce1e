import { type QueryClient } from '@tanstack/react-query';
import { type FormEvent, useState } from 'react';
import { type LoaderFunctionArgs, redirect, useNavigate, useSearchParams } from 'react-router-dom';
import { PublicLayout } from '@/components/layout/public-layout';
import { Button, Notice, TextField } from '@/components/ui';
import { meQueryOptions } from '@/features/auth/api/get-me';
import { useSignIn } from '@/features/auth/api/sign-in';
import { fieldErrorOf, isApiError } from '@/lib/api-client';
import { safeNext } from '@/lib/safe-next';

/** Someone already signed in skips the form. */
export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    try {
      await queryClient.fetchQuery(meQueryOptions());
    } catch {
      return null;
    }
    return redirect(safeNext(new URL(request.url).searchParams.get('next')));
  };

export function SignInRoute() {
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const signIn = useSignIn();
  const [email, setEmail] = useState(params.get('email') ?? '');
  const [password, setPassword] = useState('');

  function submit(event: FormEvent) {
    event.preventDefault();
    signIn.mutate(
      { email: email.trim(), password },
      { onSuccess: () => void navigate(safeNext(params.get('next')), { replace: true }) },
    );
  }

  const error = signIn.error;
  const emailError = fieldErrorOf(error, 'email');
  const passwordError = fieldErrorOf(error, 'password');
  return (
    <PublicLayout>
      <h1 className="text-xl font-semibold tracking-tight">Sign in to Quarry</h1>
      <p className="mt-1 text-sm text-ink-muted">
        Use the e-mail address your firm registered for you.
      </p>
      <form
        onSubmit={submit}
        className="mt-6 space-y-4 rounded-lg border border-line bg-panel p-5"
        noValidate
      >
        {error && !emailError && !passwordError ? (
          <Notice
            tone="danger"
            title={
              isApiError(error) && error.status === 429 ? 'Too many attempts' : 'Not signed in'
            }
          >
            {error.message}
          </Notice>
        ) : null}
        <TextField
          label="E-mail"
          type="email"
          name="email"
          autoComplete="username"
          required
          autoFocus
          error={emailError}
          value={email}
          onChange={(event) => setEmail(event.target.value)}
        />
        <TextField
          label="Password"
          type="password"
          name="password"
          autoComplete="current-password"
          required
          error={passwordError}
          value={password}
          onChange={(event) => setPassword(event.target.value)}
        />
        <Button type="submit" variant="primary" className="w-full" busy={signIn.isPending}>
          Sign in
        </Button>
      </form>
    </PublicLayout>
  );
}
