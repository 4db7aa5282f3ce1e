import { useQueries } from '@tanstack/react-query';
import { type DragEvent, type FormEvent, useId, useMemo, useRef, useState } from 'react';
import { Link } from 'react-router-dom';
import { NAME_MAX_LENGTH } from '@shared/limits';
import type { DocumentListItem, UploadedFile } from '@shared/schemas/documents';
import { Button, EmptyState, Notice, Select, TextField, describeError } from '@/components/ui';
import { cn } from '@/lib/cn';
import { JobProgress, ProgressBar } from '@/features/jobs';
import { useJob } from '@/features/jobs/api/get-job';
import { useCustodians } from '../api/get-custodians';
import { documentsQueryOptions } from '../api/get-documents';
import { formatBytes } from '../format';
import { type UploadItem, type UploadedBatch, useUploadQueue } from '../hooks/use-upload-queue';
import { DocumentStatusCell } from './document-status';

const NEW_CUSTODIAN = '__new__';

/**
 * The upload workflow: pick or drop files (or a .zip), choose or name a custodian, send
 * them with a progress bar per file, then follow extraction per file and per batch.
 */
export function UploadPanel({ matterId }: { matterId: number }) {
  const queue = useUploadQueue(matterId);
  const custodians = useCustodians(matterId);
  const [custodianChoice, setCustodianChoice] = useState('');
  const [newCustodian, setNewCustodian] = useState('');
  const [formError, setFormError] = useState<string | null>(null);

  const existing = custodians.data?.custodians ?? [];
  const choosingNew =
    custodianChoice === NEW_CUSTODIAN || (custodians.isSuccess && existing.length === 0);
  const custodianName = choosingNew
    ? newCustodian.trim()
    : (existing.find((c) => String(c.id) === custodianChoice)?.name ?? '');

  const readyCount = queue.items.filter((i) => i.phase === 'ready' || i.phase === 'error').length;
  const live = useBatchDocuments(matterId, queue.batches);

  function submit(event: FormEvent) {
    event.preventDefault();
    if (!custodianName) {
      setFormError(
        choosingNew
          ? 'Name the custodian these files come from.'
          : 'Choose the custodian these files come from.',
      );
      return;
    }
    if (readyCount === 0) {
      setFormError('Add at least one file to upload.');
      return;
    }
    setFormError(null);
    void queue.start(custodianName);
  }

  return (
    <div className="space-y-5" data-testid="upload-panel">
      <form
        onSubmit={submit}
        noValidate
        className="space-y-4 rounded-md border border-line bg-panel p-4"
        aria-labelledby="upload-form-heading"
        data-testid="upload-form"
      >
        <h2 id="upload-form-heading" className="text-sm font-semibold">
          Add files
        </h2>
        <DropZone onFiles={queue.add} disabled={queue.running} />
        <div className="flex flex-wrap items-end gap-3">
          <Select
            label="Custodian"
            className="w-64"
            name="custodianChoice"
            data-testid="custodian-select"
            disabled={custodians.isPending || queue.running}
            value={choosingNew ? NEW_CUSTODIAN : custodianChoice}
            onChange={(event) => setCustodianChoice(event.target.value)}
            options={[
              ...(existing.length ? [{ value: '', label: 'Choose a custodian…' }] : []),
              ...existing.map((c) => ({
                value: String(c.id),
                label: `${c.name} (${c.documentCount})`,
              })),
              { value: NEW_CUSTODIAN, label: 'New custodian…' },
            ]}
          />
          {choosingNew ? (
            <TextField
              label="New custodian's name"
              name="custodian"
              className="w-64"
              data-testid="custodian-name"
              maxLength={NAME_MAX_LENGTH}
              placeholder="e.g. Priya Okafor"
              value={newCustodian}
              disabled={queue.running}
              onChange={(event) => setNewCustodian(event.target.value)}
            />
          ) : null}
          <div className="flex items-center gap-2">
            <Button
              type="submit"
              variant="primary"
              busy={queue.running}
              disabled={readyCount === 0}
              data-testid="upload-start"
            >
              {queue.running
                ? 'Uploading…'
                : readyCount === 0
                  ? 'Upload'
                  : `Upload ${readyCount} ${readyCount === 1 ? 'file' : 'files'}`}
            </Button>
            {queue.running ? (
              <Button onClick={queue.cancel} data-testid="upload-cancel">
                Cancel
              </Button>
            ) : null}
          </div>
        </div>
        {custodians.isError ? (
          <Notice tone="warn">
            The custodian list could not be loaded ({describeError(custodians.error)}). You can
            still name a new custodian.
          </Notice>
        ) : null}
        {formError ? (
          <p
            className="text-sm font-medium text-danger"
            role="alert"
            data-testid="upload-form-error"
          >
            {formError}
          </p>
        ) : null}
      </form>

      <FileList
        matterId={matterId}
        items={queue.items}
        live={live}
        running={queue.running}
        onRemove={queue.remove}
        onClear={queue.clearFinished}
      />

      {queue.batches.length > 0 ? (
        <section
          aria-labelledby="processing-heading"
          className="rounded-md border border-line bg-panel p-4"
        >
          <h2 id="processing-heading" className="mb-3 text-sm font-semibold">
            Processing
          </h2>
          <ul className="space-y-4">
            {queue.batches.map((batch) => (
              <li key={batch.id}>
                <BatchJob batch={batch} />
              </li>
            ))}
          </ul>
          <p className="mt-3 text-xs text-ink-muted">
            You may leave this page: extraction and indexing go on on the server. Follow them from
            the{' '}
            <Link className="text-accent-strong underline" to={`/matters/${matterId}/documents`}>
              document list
            </Link>
            .
          </p>
        </section>
      ) : null}
    </div>
  );
}

function DropZone({ onFiles, disabled }: { onFiles: (files: File[]) => void; disabled: boolean }) {
  const inputRef = useRef<HTMLInputElement>(null);
  const hintId = useId();
  const [over, setOver] = useState(false);

  function onDrop(event: DragEvent<HTMLDivElement>) {
    event.preventDefault();
    setOver(false);
    if (disabled) return;
    const files = Array.from(event.dataTransfer.files);
    if (files.length) onFiles(files);
  }

  return (
    <div
      onDragOver={(event) => {
        event.preventDefault();
        if (!disabled) setOver(true);
      }}
      onDragLeave={() => setOver(false)}
      onDrop={onDrop}
      data-testid="drop-zone"
      className={cn(
        'flex flex-col items-center gap-2 rounded-md border-2 border-dashed px-6 py-8 text-center transition-colors',
        over ? 'border-accent bg-accent-soft' : 'border-line-strong bg-paper',
      )}
    >
      <p className="text-sm font-medium text-ink">Drop files or a .zip archive here</p>
      <p id={hintId} className="max-w-md text-xs text-ink-muted">
        PDF, Word (.docx), e-mail (.eml), HTML, plain text and Markdown. A .zip is unpacked and each
        file in it becomes a document. The type is read from the file's content.
      </p>
      <input
        ref={inputRef}
        type="file"
        multiple
        className="sr-only"
        tabIndex={-1}
        aria-hidden="true"
        data-testid="file-input"
        onChange={(event) => {
          const files = Array.from(event.target.files ?? []);
          if (files.length) onFiles(files);
          event.target.value = '';
        }}
      />
      <Button
        size="sm"
        disabled={disabled}
        aria-describedby={hintId}
        onClick={() => inputRef.current?.click()}
        data-testid="choose-files"
      >
        Choose files…
      </Button>
    </div>
  );
}

/** The live rows of every uploaded batch, keyed by document id (polled while extracting). */
function useBatchDocuments(matterId: number, batches: readonly UploadedBatch[]) {
  const results = useQueries({
    queries: batches.map((batch) =>
      documentsQueryOptions(matterId, { page: 1, pageSize: 500, batch: batch.id }),
    ),
  });
  const rows = results.flatMap((result) => result.data?.documents ?? []);
  const key = rows.map((row) => `${row.id}:${row.status}:${row.indexState}`).join(',');
  // eslint-disable-next-line react-hooks/exhaustive-deps -- `key` captures every change of `rows`
  return useMemo(() => new Map(rows.map((row) => [row.id, row])), [key]);
}

function FileList({
  matterId,
  items,
  live,
  running,
  onRemove,
  onClear,
}: {
  matterId: number;
  items: UploadItem[];
  live: Map<number, DocumentListItem>;
  running: boolean;
  onRemove: (key: string) => void;
  onClear: () => void;
}) {
  if (items.length === 0) {
    return (
      <EmptyState title="No files chosen yet">
        Files you add appear here with their progress, and then their control number and status.
      </EmptyState>
    );
  }
  const totalBytes = items.reduce((sum, item) => sum + item.file.size, 0);
  const finished = items.filter((i) => i.phase === 'uploaded' || i.phase === 'error').length;
  return (
    <section aria-labelledby="files-heading">
      <div className="mb-2 flex items-baseline justify-between gap-3">
        <h2 id="files-heading" className="text-sm font-semibold">
          Files{' '}
          <span className="font-normal text-ink-muted">
            ({items.length}, {formatBytes(totalBytes)})
          </span>
        </h2>
        {finished > 0 && !running ? (
          <Button size="sm" variant="quiet" onClick={onClear}>
            Clear finished
          </Button>
        ) : null}
      </div>
      <ul
        className="divide-y divide-line rounded-md border border-line bg-panel"
        data-testid="upload-file-list"
      >
        {items.map((item) => (
          <FileRow key={item.key} matterId={matterId} item={item} live={live} onRemove={onRemove} />
        ))}
      </ul>
    </section>
  );
}

function FileRow({
  matterId,
  item,
  live,
  onRemove,
}: {
  matterId: number;
  item: UploadItem;
  live: Map<number, DocumentListItem>;
  onRemove: (key: string) => void;
}) {
  const isArchive = item.results.length > 1 || item.results.some((r) => r.path !== item.file.name);
  const single = !isArchive ? item.results[0] : undefined;
  const children = single ? [...live.values()].filter((row) => row.parentId === single.id) : [];
  return (
    <li
      className="px-3 py-2.5"
      data-testid="upload-row"
      data-file-name={item.file.name}
      data-phase={item.phase}
    >
      <div className="flex items-center gap-3">
        <div className="min-w-0 flex-1">
          <div className="flex items-baseline gap-2">
            <span className="truncate text-sm font-medium" title={item.file.name}>
              {item.file.name}
            </span>
            <span className="shrink-0 text-xs text-ink-muted tabular-nums">
              {formatBytes(item.file.size)}
            </span>
          </div>
          <div className="mt-1.5 flex items-center gap-3">
            <ProgressBar
              className="max-w-xs"
              label={`Upload of ${item.file.name}`}
              value={item.phase === 'ready' ? 0 : item.fraction}
              tone={item.phase === 'error' ? 'danger' : item.phase === 'uploaded' ? 'ok' : 'accent'}
              testId="upload-progress"
            />
            <span className="w-20 shrink-0 text-xs text-ink-muted tabular-nums" aria-hidden="true">
              {item.phase === 'ready'
                ? 'Ready'
                : item.phase === 'uploading'
                  ? `${Math.round(item.fraction * 100)}%`
                  : item.phase === 'uploaded'
                    ? 'Sent'
                    : 'Not sent'}
            </span>
          </div>
        </div>
        <div className="w-[22rem] shrink-0 text-sm">
          {item.phase === 'error' ? (
            <p className="text-xs font-medium text-danger" role="alert" data-testid="upload-error">
              {item.error}
            </p>
          ) : single ? (
            <ResultLine matterId={matterId} result={single} live={live.get(single.id)} />
          ) : isArchive ? (
            <p className="text-xs text-ink-muted">
              Archive unpacked: {item.results.length}{' '}
              {item.results.length === 1 ? 'document' : 'documents'}
            </p>
          ) : item.phase === 'uploaded' ? (
            <p className="text-xs text-warn">The server listed no document for this file.</p>
          ) : null}
        </div>
        <div className="w-16 shrink-0 text-right">
          {item.phase === 'ready' || item.phase === 'error' ? (
            <Button
              size="sm"
              variant="quiet"
              onClick={() => onRemove(item.key)}
              aria-label={`Remove ${item.file.name} from the upload`}
            >
              Remove
            </Button>
          ) : null}
        </div>
      </div>
      {isArchive || children.length > 0 ? (
        <ul className="mt-2 ml-4 space-y-1 border-l border-line pl-3">
          {(isArchive ? item.results : []).map((result) => (
            <li key={result.id} className="flex items-center gap-3 text-xs">
              <span className="min-w-0 flex-1 truncate text-ink-muted" title={result.path}>
                {result.path.slice(item.file.name.length + 1) || result.name}
              </span>
              <span className="w-[22rem] shrink-0">
                <ResultLine matterId={matterId} result={result} live={live.get(result.id)} />
              </span>
              <span className="w-16 shrink-0" />
            </li>
          ))}
          {children.map((child) => (
            <li key={child.id} className="flex items-center gap-3 text-xs">
              <span className="min-w-0 flex-1 truncate text-ink-muted">
                Attachment: {child.name}
              </span>
              <span className="w-[22rem] shrink-0">
                <ResultLine
                  matterId={matterId}
                  result={{
                    ...child,
                    error: child.error ?? undefined,
                    duplicateOf: child.duplicateOf ?? undefined,
                  }}
                  live={child}
                />
              </span>
              <span className="w-16 shrink-0" />
            </li>
          ))}
        </ul>
      ) : null}
    </li>
  );
}

/** Control number and status of one document, live once the batch is being polled. */
function ResultLine({
  matterId,
  result,
  live,
}: {
  matterId: number;
  result: UploadedFile;
  live: DocumentListItem | undefined;
}) {
  const status = live?.status ?? result.status;
  const error = live?.error ?? result.error;
  return (
    <span
      className="flex items-center gap-2"
      data-testid="upload-result"
      data-control-number={result.controlNumber}
      data-status={status}
    >
      <Link
        to={`/matters/${matterId}/documents/${result.id}`}
        className="w-28 shrink-0 font-mono text-[13px] text-accent-strong underline-offset-2 hover:underline"
      >
        {result.controlNumber}
      </Link>
      <DocumentStatusCell
        matterId={matterId}
        status={status}
        error={error}
        duplicateOf={live?.duplicateOf ?? result.duplicateOf}
        duplicateOfControlNumber={result.duplicateOfControlNumber}
      />
    </span>
  );
}

function BatchJob({ batch }: { batch: UploadedBatch }) {
  const job = useJob(batch.jobId);
  return (
    <div className="space-y-2" data-testid={`batch-${batch.id}`}>
      {batch.jobId == null ? (
        <p className="text-[13px] text-ink-muted">
          Batch {batch.id}: nothing to extract (every file was a duplicate or failed on arrival).
        </p>
      ) : job.isPending ? (
        <ProgressBar label={`Extraction of batch ${batch.id}`} value={null} />
      ) : job.isError ? (
        <Notice tone="warn">
          The extraction progress could not be read: {describeError(job.error)}
        </Notice>
      ) : (
        <JobProgress job={job.data.job} title={`Text extraction, batch ${batch.id}`} />
      )}
      {batch.skipped.length > 0 ? (
        <details className="text-xs text-ink-muted">
          <summary className="cursor-pointer">
            {batch.skipped.length} {batch.skipped.length === 1 ? 'entry' : 'entries'} of an archive
            left out
          </summary>
          <ul className="mt-1 space-y-0.5 pl-4">
            {batch.skipped.map((entry) => (
              <li key={entry.path}>
                <span className="font-mono">{entry.path}</span>: {entry.reason}
              </li>
            ))}
          </ul>
        </details>
      ) : null}
    </div>
  );
}
