import { useQuery } from '@tanstack/react-query';
import { devMailQueryOptions } from '@/features/dev-mail/api/get-dev-mail';

export function AppFooter() {
  // The dev mailbox exists only in demo/dev mode; elsewhere the endpoint is a 404.
  const devMail = useQuery({ ...devMailQueryOptions(), retry: false, staleTime: 5 * 60_000 });
  return (
    <footer className="border-t border-line">
      <div className="mx-auto flex max-w-[88rem] items-center gap-4 px-4 py-2 text-xs text-ink-muted">
        <span>Quarry — concept search and review for legal teams</span>
        {devMail.isSuccess ? (
          <a
            href="/dev/mail"
            className="ml-auto underline decoration-line-strong underline-offset-2 hover:text-ink"
            data-testid="footer-dev-mail"
          >
            Demo mailbox
          </a>
        ) : null}
      </div>
    </footer>
  );
}
