import { Link } from 'react-router-dom';
import type { DocumentDetailResponse, DocumentRef } from '@shared/schemas/documents';
import { ErrorPanel, Notice, SkeletonRows } from '@/components/ui';
import { formatDate, formatDateTime } from '@/lib/format';
import { documentOriginalHref } from '../api/get-document';
import { useDocumentText } from '../api/get-document-text';
import { docTypeLabel, formatBytes } from '../format';
import { DocumentStatusCell, IndexStateBadge } from './document-status';

/**
 * A document's metadata, family and extracted text. Kept small and self-contained so the
 * review viewer can grow from it (coding panel, hit highlighting, page images).
 */
export function DocumentView({
  matterId,
  data,
}: {
  matterId: number;
  data: DocumentDetailResponse;
}) {
  const { document, family, duplicateOf, duplicates } = data;
  const hasText = document.status === 'extracted';
  return (
    <div className="grid gap-5 lg:grid-cols-[minmax(0,1fr)_21rem]" data-testid="document-view">
      <section aria-labelledby="text-heading" className="min-w-0">
        <h2 id="text-heading" className="mb-2 text-sm font-semibold">
          Extracted text
        </h2>
        {hasText ? (
          <DocumentText matterId={matterId} docId={document.id} />
        ) : document.status === 'failed' ? (
          <Notice tone="danger" title="No text: extraction failed">
            {document.error ?? 'The file could not be read.'}
          </Notice>
        ) : document.status === 'duplicate' ? (
          <Notice tone="info" title="An exact copy">
            This file is byte-for-byte the same as{' '}
            {duplicateOf ? <RefLink matterId={matterId} doc={duplicateOf} /> : 'another document'};
            its text is read and indexed there once.
          </Notice>
        ) : (
          <Notice tone="info" title="Text not extracted yet">
            The file is waiting for, or in, text extraction. This page updates by itself.
          </Notice>
        )}
      </section>

      <aside className="space-y-4" aria-label="About this document">
        <section
          className="rounded-md border border-line bg-panel p-4"
          aria-labelledby="meta-heading"
        >
          <h2 id="meta-heading" className="mb-2 text-sm font-semibold">
            Metadata
          </h2>
          <dl className="grid grid-cols-[6.5rem_minmax(0,1fr)] gap-x-2 gap-y-1 text-[13px]">
            <dt className="text-ink-muted">Control no.</dt>
            <dd className="font-mono" data-testid="document-control-number">
              {document.controlNumber}
            </dd>
            <dt className="text-ink-muted">Status</dt>
            <dd>
              <DocumentStatusCell
                matterId={matterId}
                status={document.status}
                error={document.error}
                duplicateOf={document.duplicateOf}
                duplicateOfControlNumber={duplicateOf?.controlNumber}
              />
            </dd>
            <dt className="text-ink-muted">Index</dt>
            <dd>
              <IndexStateBadge state={document.indexState} />
            </dd>
            <dt className="text-ink-muted">Custodian</dt>
            <dd>{document.custodian?.name ?? '—'}</dd>
            <dt className="text-ink-muted">Type</dt>
            <dd>
              {docTypeLabel(document.docType)}{' '}
              <span className="text-xs text-ink-muted">({document.mime})</span>
            </dd>
            <dt className="text-ink-muted">{document.docType === 'email' ? 'From' : 'Author'}</dt>
            <dd className="break-words">{document.author || '—'}</dd>
            {document.recipients ? (
              <>
                <dt className="text-ink-muted">To / cc</dt>
                <dd className="break-words">{document.recipients}</dd>
              </>
            ) : null}
            <dt className="text-ink-muted">Date</dt>
            <dd>{formatDateTime(document.sentAt)}</dd>
            <dt className="text-ink-muted">Pages</dt>
            <dd className="tabular-nums">{document.pageCount ?? '—'}</dd>
            <dt className="text-ink-muted">Size</dt>
            <dd className="tabular-nums">{formatBytes(document.size)}</dd>
            <dt className="text-ink-muted">File</dt>
            <dd className="break-all">{document.path}</dd>
            <dt className="text-ink-muted">Loaded</dt>
            <dd>{formatDate(document.createdAt)}</dd>
            <dt className="text-ink-muted">SHA-256</dt>
            <dd className="font-mono text-[11px] break-all text-ink-muted">{document.sha256}</dd>
          </dl>
          <a
            href={documentOriginalHref(matterId, document.id)}
            className="mt-3 inline-block text-[13px] font-medium text-accent-strong underline-offset-2 hover:underline"
            data-testid="download-original"
          >
            Download the original
          </a>
        </section>

        <section
          className="rounded-md border border-line bg-panel p-4"
          aria-labelledby="family-heading"
        >
          <h2 id="family-heading" className="mb-2 text-sm font-semibold">
            Family
          </h2>
          {family.parent == null && family.attachments.length === 0 ? (
            <p className="text-[13px] text-ink-muted">No parent e-mail and no attachments.</p>
          ) : (
            <div className="space-y-2 text-[13px]" data-testid="document-family">
              {family.parent ? (
                <p>
                  <span className="text-ink-muted">Attached to </span>
                  <RefLink matterId={matterId} doc={family.parent} />
                </p>
              ) : null}
              {family.attachments.length > 0 ? (
                <div>
                  <p className="text-ink-muted">Attachments ({family.attachments.length})</p>
                  <ul className="mt-1 space-y-0.5">
                    {family.attachments.map((attachment) => (
                      <li key={attachment.id}>
                        <RefLink matterId={matterId} doc={attachment} />
                      </li>
                    ))}
                  </ul>
                </div>
              ) : null}
            </div>
          )}
        </section>

        {duplicates.length > 0 ? (
          <section
            className="rounded-md border border-line bg-panel p-4"
            aria-labelledby="dups-heading"
          >
            <h2 id="dups-heading" className="mb-2 text-sm font-semibold">
              Recorded duplicates ({duplicates.length})
            </h2>
            <ul className="space-y-0.5 text-[13px]">
              {duplicates.map((copy) => (
                <li key={copy.id}>
                  <RefLink matterId={matterId} doc={copy} />
                </li>
              ))}
            </ul>
          </section>
        ) : null}
      </aside>
    </div>
  );
}

function RefLink({ matterId, doc }: { matterId: number; doc: DocumentRef }) {
  return (
    <Link
      to={`/matters/${matterId}/documents/${doc.id}`}
      className="text-accent-strong underline-offset-2 hover:underline"
    >
      <span className="font-mono">{doc.controlNumber}</span>{' '}
      <span className="text-ink">{doc.title || doc.name}</span>
    </Link>
  );
}

function DocumentText({ matterId, docId }: { matterId: number; docId: number }) {
  const text = useDocumentText(matterId, docId);
  if (text.isPending) return <SkeletonRows rows={8} label="Loading the text" />;
  if (text.isError)
    return (
      <ErrorPanel
        error={text.error}
        title="The text could not be loaded"
        onRetry={() => void text.refetch()}
      />
    );
  return text.data.body.trim() ? (
    <div
      className="font-document max-h-[70vh] overflow-y-auto rounded-md border border-line bg-panel px-6 py-5 text-[15px] leading-relaxed whitespace-pre-wrap"
      data-testid="document-text"
      tabIndex={0}
      aria-label="Extracted text"
    >
      {text.data.body}
    </div>
  ) : (
    <Notice tone="info">The file was read, but it holds no text.</Notice>
  );
}
