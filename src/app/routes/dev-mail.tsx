import { Fragment, useState } from 'react';
import { Link } from 'react-router-dom';
import { PublicLayout } from '@/components/layout/public-layout';
import { Button, EmptyState, Notice, PageHeader, QueryBoundary } from '@/components/ui';
import { type DevMailMessage, useDevMail } from '@/features/dev-mail/api/get-dev-mail';
import { isApiError } from '@/lib/api-client';
import { formatDateTime } from '@/lib/format';

/**
 * /dev/mail — the fake SMTP server's mailbox: open under `npm run dev`, for firm admins
 * in demo mode (its links let whoever reads them choose a new account's password).
 */
export function DevMailRoute() {
  const mail = useDevMail();
  if (mail.isError && isApiError(mail.error) && [401, 403].includes(mail.error.status)) {
    return (
      <PublicLayout>
        <Notice tone="info" title="Firm administrators only">
          The demo mailbox holds invitation and set-up links, which let whoever opens them choose an
          account&apos;s password.{' '}
          {mail.error.status === 401 ? (
            <Link
              to="/sign-in?next=%2Fdev%2Fmail"
              className="font-medium text-accent-strong underline underline-offset-2"
            >
              Sign in as a firm administrator
            </Link>
          ) : (
            'Sign in as a firm administrator'
          )}{' '}
          to read it.
        </Notice>
      </PublicLayout>
    );
  }
  if (mail.isError && isApiError(mail.error) && mail.error.status === 404) {
    return (
      <PublicLayout>
        <Notice tone="info" title="No demo mailbox">
          This installation sends real e-mail, so there is no mailbox to show here.
        </Notice>
      </PublicLayout>
    );
  }
  return (
    <PublicLayout wide>
      <PageHeader
        eyebrow="Demo mode"
        title="Demo mailbox"
        description="Messages Quarry sent through its local test mail server. Nothing here left this machine."
        actions={
          <Button
            size="sm"
            busy={mail.isFetching && !mail.isPending}
            onClick={() => void mail.refetch()}
          >
            Refresh
          </Button>
        }
      />
      <QueryBoundary query={mail} errorTitle="The mailbox could not be read">
        {({ messages, fakeSmtp }) =>
          !fakeSmtp ? (
            <Notice tone="info" title="Real e-mail is on">
              SMTP_URL is set, so messages go to the real mail server and none are kept here.
            </Notice>
          ) : messages.length === 0 ? (
            <EmptyState title="No messages yet">
              Invitations appear here as soon as a lead sends them.
            </EmptyState>
          ) : (
            <ol className="space-y-3" data-testid="dev-mail-list">
              {[...messages]
                .sort((a, b) => b.receivedAt.localeCompare(a.receivedAt))
                .map((message) => (
                  <MailItem key={message.id} message={message} />
                ))}
            </ol>
          )
        }
      </QueryBoundary>
    </PublicLayout>
  );
}

function MailItem({ message }: { message: DevMailMessage }) {
  const [open, setOpen] = useState(true);
  return (
    <li className="rounded-md border border-line bg-panel" data-testid="dev-mail-message">
      <button
        type="button"
        aria-expanded={open}
        onClick={() => setOpen(!open)}
        className="flex w-full items-baseline gap-3 px-4 py-2 text-left"
      >
        <span className="min-w-0 flex-1 truncate font-medium">
          {message.subject || '(no subject)'}
        </span>
        <span className="shrink-0 text-xs text-ink-muted tabular-nums">
          {formatDateTime(message.receivedAt)}
        </span>
      </button>
      {open ? (
        <div className="border-t border-line px-4 py-3">
          <dl className="grid grid-cols-[3.5rem_1fr] gap-y-0.5 text-[13px]">
            <dt className="text-ink-muted">From</dt>
            <dd>{message.from}</dd>
            <dt className="text-ink-muted">To</dt>
            <dd data-testid="dev-mail-to">{message.to.join(', ')}</dd>
          </dl>
          <div className="font-document mt-3 text-[15px] leading-relaxed whitespace-pre-wrap">
            <LinkifiedText text={message.text} />
          </div>
          {message.links.length > 0 ? (
            <div className="mt-3 border-t border-line pt-2">
              <p className="text-xs font-semibold text-ink-muted">Links in this message</p>
              <ul className="mt-1 space-y-0.5 text-[13px]">
                {message.links.map((link) => (
                  <li key={link}>
                    <a
                      href={link}
                      className="break-all text-accent-strong underline underline-offset-2"
                      data-testid="dev-mail-link"
                    >
                      {link}
                    </a>
                  </li>
                ))}
              </ul>
            </div>
          ) : null}
        </div>
      ) : null}
    </li>
  );
}

const URL_PATTERN = /(https?:\/\/[^\s<>"')]+)/g;

/** Plain text with its http(s) addresses turned into links (no HTML from the mail is rendered). */
function LinkifiedText({ text }: { text: string }) {
  const parts = text.split(URL_PATTERN);
  return (
    <>
      {parts.map((part, index) =>
        index % 2 === 1 ? (
          <a
            key={index}
            href={part}
            className="break-all text-accent-strong underline underline-offset-2"
          >
            {part}
          </a>
        ) : (
          <Fragment key={index}>{part}</Fragment>
        ),
      )}
    </>
  );
}
