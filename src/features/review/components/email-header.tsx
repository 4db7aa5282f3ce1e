import type { ReviewDocument } from '@shared/schemas/review';
import { formatDateTime } from '@/lib/format';

/** An e-mail's header block as its headers state it (RFC 5322 3.6: From, To, Cc, Date, Subject). */
export function EmailHeader({ doc, subject }: { doc: ReviewDocument; subject: string }) {
  const rows: [string, string][] = [
    ['From', doc.emailFrom || doc.author],
    ['To', doc.emailTo || (doc.emailFrom ? '' : doc.recipients)],
    ['Cc', doc.emailCc],
    ['Bcc', doc.emailBcc],
    ['Date', doc.sentAt ? formatDateTime(doc.sentAt) : ''],
    ['Subject', subject],
  ];
  return (
    <dl
      className="mb-3 grid grid-cols-[4.5rem_minmax(0,1fr)] gap-x-2 gap-y-0.5 rounded-md border border-line bg-sunk p-3 text-[13px]"
      data-testid="email-header"
    >
      {rows
        .filter(([, value]) => value)
        .map(([label, value]) => (
          <div key={label} className="contents">
            <dt className="font-semibold text-ink-muted">{label}</dt>
            <dd className="min-w-0 break-words" data-testid={`email-${label.toLowerCase()}`}>
              {value}
            </dd>
          </div>
        ))}
    </dl>
  );
}
