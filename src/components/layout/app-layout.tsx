import { Navigate, NavLink, Outlet, useLocation, useNavigate } from 'react-router-dom';
import { useMe } from '@/features/auth/api/get-me';
import { useSignOut } from '@/features/auth/api/sign-out';
import { cn } from '@/lib/cn';
import { Button } from '../ui';
import { AppFooter } from './app-footer';
import { DemoBanner } from './demo-banner';
import { Wordmark } from './wordmark';

const navLinkClass = ({ isActive }: { isActive: boolean }) =>
  cn(
    'rounded px-2 py-1 text-sm font-medium',
    isActive ? 'bg-accent-soft text-accent-strong' : 'text-ink-muted hover:text-ink hover:bg-sunk',
  );

/** The signed-in shell: top bar, the page, and a quiet footer. */
export function AppLayout() {
  const me = useMe();
  const signOut = useSignOut();
  const navigate = useNavigate();
  const user = me.data?.user;
  const { pathname } = useLocation();
  // A temporary password set by a firm admin: the server refuses everything else until
  // it is changed, so the only page offered is the password change.
  if (me.data?.passwordChangeRequired && pathname !== '/account')
    return <Navigate to="/account" replace />;

  return (
    <div className="flex min-h-screen flex-col">
      <a
        href="#main"
        className="sr-only focus:not-sr-only focus:absolute focus:top-2 focus:left-2 focus:z-50 focus:rounded focus:bg-panel focus:px-3 focus:py-2"
      >
        Skip to content
      </a>
      <DemoBanner />
      <header className="border-t-[3px] border-b border-t-accent border-b-line bg-panel">
        <div className="mx-auto flex h-12 max-w-[88rem] items-center gap-5 px-4">
          <Wordmark />
          <nav aria-label="Main" className="flex items-center gap-1">
            <NavLink to="/matters" className={navLinkClass} data-testid="nav-matters">
              My matters
            </NavLink>
            {user?.isAdmin ? (
              <NavLink to="/admin" className={navLinkClass} data-testid="nav-admin">
                Firm admin
              </NavLink>
            ) : null}
          </nav>
          <div className="ml-auto flex items-center gap-2">
            {user ? (
              <NavLink
                to="/account"
                className={navLinkClass}
                data-testid="nav-account"
                title={user.email}
              >
                {user.name}
              </NavLink>
            ) : null}
            <Button
              size="sm"
              variant="quiet"
              busy={signOut.isPending}
              data-testid="sign-out"
              onClick={() =>
                signOut.mutate(undefined, {
                  onSettled: () => void navigate('/sign-in', { replace: true }),
                })
              }
            >
              Sign out
            </Button>
          </div>
        </div>
      </header>
      <div id="main" className="flex-1">
        <Outlet />
      </div>
      <AppFooter />
    </div>
  );
}
