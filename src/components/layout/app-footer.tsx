import { useMe } from '@/features/auth/api/get-me';
import { useInstance } from '@/features/dev-mail/api/get-instance';

export function AppFooter() {
  // The dev mailbox: anyone's under `npm run dev`, firm admins' in demo mode, else none.
  const access = useInstance().data?.devMailbox ?? 'off';
  const me = useMe();
  const showMailbox =
    access === 'anyone' || (access === 'firm-admins' && me.data?.user.isAdmin === true);
  return (
    <footer className="border-t border-line">
      <div className="mx-auto flex max-w-[88rem] items-center gap-4 px-4 py-2 text-xs text-ink-muted">
        <span>Quarry — concept search and review for legal teams</span>
        {showMailbox ? (
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
