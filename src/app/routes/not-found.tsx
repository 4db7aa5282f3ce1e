import { Link } from 'react-router-dom';
import { EmptyState } from '@/components/ui';

export function NotFoundPanel({ what = 'page' }: { what?: 'page' | 'matter' }) {
  return (
    <div className="mx-auto max-w-[88rem] px-4 py-10" data-testid="not-found">
      <EmptyState
        title={what === 'matter' ? 'No such matter' : 'Page not found'}
        action={
          <Link
            to="/matters"
            className="text-sm font-medium text-accent-strong underline underline-offset-2"
          >
            Back to my matters
          </Link>
        }
      >
        {what === 'matter'
          ? 'This matter does not exist, or you hold no role on it. A matter lead can invite you.'
          : 'Nothing lives at this address.'}
      </EmptyState>
    </div>
  );
}

export function NotFoundRoute() {
  return <NotFoundPanel />;
}
