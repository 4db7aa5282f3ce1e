import type { ReactNode } from 'react';
import { Link, useLocation } from 'react-router-dom';
import { AppFooter } from './app-footer';
import { DemoBanner } from './demo-banner';
import { Wordmark } from './wordmark';

/** Pages reached without a session: sign-in, invitation, dev mailbox. */
export function PublicLayout({ children, wide = false }: { children: ReactNode; wide?: boolean }) {
  const onSignIn = useLocation().pathname.startsWith('/sign-in');
  return (
    <div className="flex min-h-screen flex-col">
      <DemoBanner />
      <header className="border-t-[3px] border-b border-t-accent border-b-line bg-panel">
        <div className="mx-auto flex h-12 max-w-[88rem] items-center px-4">
          <Wordmark to="/" />
          {onSignIn ? null : (
            <Link
              to="/sign-in"
              className="ml-auto rounded px-2 py-1 text-sm font-medium text-accent-strong hover:bg-accent-soft"
            >
              Sign in
            </Link>
          )}
        </div>
      </header>
      <main
        id="main"
        className={
          wide
            ? 'mx-auto w-full max-w-5xl flex-1 px-4 py-8'
            : 'mx-auto w-full max-w-md flex-1 px-4 py-12'
        }
      >
        {children}
      </main>
      <AppFooter />
    </div>
  );
}
