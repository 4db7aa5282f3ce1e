import { useState } from 'react';
import { Link } from 'react-router-dom';
import type { DocumentListItem } from '../../../../shared/schemas/documents';
import type { NearDuplicateMemberRef } from '../../../../shared/schemas/relationships';
import { Badge, Button, ErrorPanel, SkeletonRows } from '../../../components/ui';
import { formatDateTime } from '../../../lib/format';
import { useDocumentText } from '../api/get-document-text';
import { useDocumentThread } from '../api/get-document-thread';
import { useNearDuplicates } from '../api/get-near-duplicates';
import { diffTexts } from '../text-diff';

/**
 * Collection metadata, the e-mail thread and the near-duplicate group of one document.
 * Self-contained (it fetches what it shows) so the document page and the review viewer
 * include it with one line: <DocumentRelationships matterId={..} document={..} />.
 */
export function DocumentRelationships({
  matterId,
  document,
}: {
  matterId: number;
  document: DocumentListItem;
}) {
  return (
    <div className="space-y-4" data-testid="document-relationships">
      <CollectionMetadata matterId={matterId} document={document} />
      {document.threadId !== null ? <ThreadTree matterId={matterId} document={document} /> : null}
      {document.nearDuplicateGroupId !== null ? (
        <NearDuplicates matterId={matterId} document={document} />
      ) : null}
    </div>
  );
}

const panel = 'rounded-md border border-line bg-panel p-4';

function Row({
  label,
  value,
  mono = false,
}: {
  label: string;
  value: string | null;
  mono?: boolean;
}) {
  if (!value) return null;
  return (
    <>
      <dt className="text-ink-muted">{label}</dt>
      <dd className={mono ? 'font-mono text-[12px] break-all' : 'break-words'}>{value}</dd>
    </>
  );
}

function CollectionMetadata({
  matterId,
  document: d,
}: {
  matterId: number;
  document: DocumentListItem;
}) {
  const isEmail = Boolean(d.emailFrom || d.messageId);
  return (
    <section className={panel} aria-labelledby="collection-heading">
      <h2 id="collection-heading" className="mb-2 flex items-center gap-2 text-sm font-semibold">
        Collection metadata
        {d.ocr ? (
          <Badge tone="info" className="font-normal">
            Text from OCR
          </Badge>
        ) : null}
      </h2>
      <dl
        className="grid grid-cols-[6.5rem_minmax(0,1fr)] gap-x-2 gap-y-1 text-[13px]"
        data-testid="collection-metadata"
      >
        {isEmail ? (
          <>
            <Row label="From" value={d.emailFrom} />
            <Row label="To" value={d.emailTo} />
            <Row label="Cc" value={d.emailCc} />
            <Row label="Bcc" value={d.emailBcc} />
            <Row label="Sent" value={d.sentAt ? formatDateTime(d.sentAt) : null} />
            <Row label="Received" value={d.receivedAt ? formatDateTime(d.receivedAt) : null} />
            <Row label="Message-ID" value={d.messageId} mono />
            <Row label="In-Reply-To" value={d.inReplyTo} mono />
            <Row label="References" value={d.references} mono />
          </>
        ) : null}
        <Row label="Author" value={isEmail ? null : d.author} />
        <Row label="Last author" value={d.lastAuthor} />
        <Row label="Created" value={d.fileCreatedAt ? formatDateTime(d.fileCreatedAt) : null} />
        <Row label="Modified" value={d.fileModifiedAt ? formatDateTime(d.fileModifiedAt) : null} />
        <Row label="Source path" value={d.path} />
        <dt className="text-ink-muted">Family</dt>
        <dd>
          {d.familyId === d.id ? (
            'Top-level item'
          ) : (
            <Link
              to={`/matters/${matterId}/documents/${d.familyId}`}
              className="text-accent-strong underline-offset-2 hover:underline"
            >
              Open the top-level item
            </Link>
          )}
          {d.familyDate ? (
            <span className="text-ink-muted"> · family date {formatDateTime(d.familyDate)}</span>
          ) : null}
        </dd>
        <dt className="text-ink-muted">All custodians</dt>
        <dd data-testid="all-custodians">
          {d.allCustodians.length ? d.allCustodians.map((c) => c.name).join(', ') : '—'}
        </dd>
      </dl>
    </section>
  );
}

function ThreadTree({ matterId, document }: { matterId: number; document: DocumentListItem }) {
  const thread = useDocumentThread(matterId, document.id);
  return (
    <section className={panel} aria-labelledby="thread-heading">
      <h2 id="thread-heading" className="mb-2 text-sm font-semibold">
        Thread{thread.data ? ` (${thread.data.messages.length})` : ''}
      </h2>
      {thread.isPending ? (
        <SkeletonRows rows={3} label="Loading the thread" />
      ) : thread.isError ? (
        <ErrorPanel
          error={thread.error}
          title="The thread could not be loaded"
          onRetry={() => void thread.refetch()}
        />
      ) : (
        <>
          <ul className="space-y-1 text-[13px]" data-testid="thread-tree" role="tree">
            {thread.data.messages.map((m) => (
              <li
                key={m.id}
                role="treeitem"
                aria-level={m.depth + 1}
                aria-current={m.id === document.id ? 'true' : undefined}
                style={{ paddingLeft: `${Math.min(m.depth, 8) * 0.9}rem` }}
                className={m.id === document.id ? 'font-semibold' : undefined}
              >
                <Link
                  to={`/matters/${matterId}/documents/${m.id}`}
                  className="text-accent-strong underline-offset-2 hover:underline"
                >
                  <span className="font-mono">{m.controlNumber}</span>{' '}
                  <span className="text-ink">{m.title}</span>
                </Link>
                <span className="block text-xs text-ink-muted">
                  {m.from || '—'} · {formatDateTime(m.sentAt)}
                  {m.inclusive ? (
                    <Badge tone="ok" className="ml-1.5">
                      Inclusive
                    </Badge>
                  ) : null}
                </span>
              </li>
            ))}
          </ul>
          <p className="mt-2 text-xs text-ink-muted">
            Inclusive messages hold the text and attachments of the earlier messages of their
            branch; reading them covers the thread. Check before relying on it for a decision.
          </p>
        </>
      )}
    </section>
  );
}

function NearDuplicates({ matterId, document }: { matterId: number; document: DocumentListItem }) {
  const group = useNearDuplicates(matterId, document.id);
  const [comparing, setComparing] = useState<NearDuplicateMemberRef | null>(null);
  const principal = group.data?.members.find((m) => m.principal);
  return (
    <section className={panel} aria-labelledby="near-dup-heading">
      <h2 id="near-dup-heading" className="mb-2 text-sm font-semibold">
        Near-duplicates{group.data ? ` (${group.data.members.length})` : ''}
      </h2>
      {group.isPending ? (
        <SkeletonRows rows={3} label="Loading the near-duplicates" />
      ) : group.isError ? (
        <ErrorPanel
          error={group.error}
          title="The near-duplicates could not be loaded"
          onRetry={() => void group.refetch()}
        />
      ) : (
        <>
          <ul className="space-y-1 text-[13px]" data-testid="near-duplicates">
            {group.data.members.map((m) => (
              <li key={m.id} className="flex items-baseline justify-between gap-2">
                <Link
                  to={`/matters/${matterId}/documents/${m.id}`}
                  className="min-w-0 truncate text-accent-strong underline-offset-2 hover:underline"
                  aria-current={m.id === document.id ? 'true' : undefined}
                >
                  <span className="font-mono">{m.controlNumber}</span>{' '}
                  <span className="text-ink">{m.title}</span>
                </Link>
                <span className="shrink-0 text-xs tabular-nums text-ink-muted">
                  {m.principal ? (
                    <Badge tone="accent">Principal</Badge>
                  ) : (
                    `${Math.round(m.similarity * 100)}%`
                  )}
                </span>
              </li>
            ))}
          </ul>
          <p className="mt-2 text-xs text-ink-muted">
            Similarity is the estimated share of shared word sequences with the principal (grouped
            at {Math.round(group.data.threshold * 100)}% or more). It assists review and does not
            decide that two documents say the same thing.
          </p>
          {principal && principal.id !== document.id ? (
            <Button
              size="sm"
              variant="secondary"
              className="mt-2"
              onClick={() => setComparing(comparing ? null : principal)}
              data-testid="compare-principal"
            >
              {comparing ? 'Hide the comparison' : 'Compare with the principal'}
            </Button>
          ) : null}
          {comparing ? (
            <SideBySide matterId={matterId} principalId={comparing.id} otherId={document.id} />
          ) : null}
        </>
      )}
    </section>
  );
}

function SideBySide({
  matterId,
  principalId,
  otherId,
}: {
  matterId: number;
  principalId: number;
  otherId: number;
}) {
  const left = useDocumentText(matterId, principalId);
  const right = useDocumentText(matterId, otherId);
  if (left.isPending || right.isPending)
    return <SkeletonRows rows={4} label="Loading both texts" />;
  if (left.isError || right.isError)
    return <ErrorPanel error={left.error ?? right.error} title="The texts could not be loaded" />;
  const parts = diffTexts(left.data.body, right.data.body);
  return (
    <div className="mt-3 grid gap-2 text-[13px] md:grid-cols-2" data-testid="near-dup-diff">
      <div className="max-h-80 overflow-y-auto rounded border border-line p-2 whitespace-pre-wrap">
        <p className="mb-1 text-xs font-semibold text-ink-muted">
          Principal ({left.data.controlNumber})
        </p>
        {parts
          .filter((p) => p.kind !== 'added')
          .map((p, i) =>
            p.kind === 'removed' ? (
              <del key={i} className="bg-danger-soft text-danger">
                {p.text}{' '}
              </del>
            ) : (
              <span key={i}>{p.text} </span>
            ),
          )}
      </div>
      <div className="max-h-80 overflow-y-auto rounded border border-line p-2 whitespace-pre-wrap">
        <p className="mb-1 text-xs font-semibold text-ink-muted">
          This document ({right.data.controlNumber})
        </p>
        {parts
          .filter((p) => p.kind !== 'removed')
          .map((p, i) =>
            p.kind === 'added' ? (
              <ins key={i} className="bg-ok-soft text-ok no-underline">
                {p.text}{' '}
              </ins>
            ) : (
              <span key={i}>{p.text} </span>
            ),
          )}
      </div>
    </div>
  );
}
