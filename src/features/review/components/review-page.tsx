import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import { Link, useNavigate, useSearchParams } from 'react-router-dom';
import { chooseCode, missingRequiredGroups, type PrivilegeFieldsReq } from '@shared/schemas/codes';
import { ReviewCaution } from '@/components/review-caution';
import { Badge, ErrorPanel, Notice, PageHeader, SkeletonRows } from '@/components/ui';
import { isApiError } from '@/lib/api-client';
import { useMatterPermission } from '@/lib/authorization';
import { formatDateTime } from '@/lib/format';
import { type Code, activeCodes, useCodes } from '@/features/codes/api/get-codes';
import { useSetDocumentCodes } from '@/features/codes/api/set-document-codes';
import { documentOriginalHref } from '@/features/documents/api/get-document';
import { docTypeLabel, formatBytes } from '@/features/documents';
import { useUnlockDocument } from '@/features/qc/api/unlock-document';
import { RedactionPanel } from '@/features/redactions';
import { type SearchState, hasSearch, parseSearchState, searchHref } from '@/features/search';
import { type ReviewResponse, useReview } from '../api/get-review';
import { plural } from '../format';
import { codeKeyMap, isTypingTarget } from '../keyboard';
import { useBatchPosition } from '../use-batch-position';
import { useReviewPosition } from '../use-review-position';
import { CodingPanel } from './coding-panel';
import { EmailHeader } from './email-header';
import { KeyLegend, useLegendOpen } from './key-legend';
import { NotesPanel } from './notes-panel';
import { PdfPages } from './pdf-pages';
import { PrivilegePanel } from './privilege-panel';
import { ReviewText } from './review-text';
import { UndoToast } from './undo-toast';

export function highlightFor(state: SearchState) {
  return {
    q: state.likeDocumentId || state.passage ? undefined : state.query || undefined,
    mode: state.mode,
  };
}

export function MissingDocument({ matterId }: { matterId: number }) {
  return (
    <Notice tone="warn" title="No such document">
      This matter has no document at that address.{' '}
      <Link className="underline" to={`/matters/${matterId}/search`}>
        Back to search
      </Link>
    </Notice>
  );
}

interface Undo {
  message: string;
  codeIds: number[];
}

/**
 * One document: its pages (PDF) or text, e-mail header, codes by group, notes, privilege
 * entry and family. Opened from a search (?q=&pos=) or from a batch (?batch=), whose order
 * j / k follow; in a batch, j waits until every required group is coded.
 */
export function ReviewPage({ matterId, docId }: { matterId: number; docId: number }) {
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const state = useMemo(() => parseSearchState(params), [params]);
  const batchId = Number(params.get('batch')) || null;
  const fromSearch = hasSearch(state) && batchId === null ? state : null;
  const rawPos = Number(params.get('pos'));
  const position = fromSearch && Number.isInteger(rawPos) && rawPos >= 0 ? rawPos : null;
  const highlight = highlightFor(state);

  const review = useReview(matterId, docId, highlight);
  const codes = useCodes(matterId);
  const coding = useSetDocumentCodes(matterId);
  const unlock = useUnlockDocument(matterId);
  const searchNav = useReviewPosition(matterId, fromSearch, position);
  const batchNav = useBatchPosition(matterId, batchId, docId);
  const nav = batchNav ?? searchNav;
  const canCode = useMatterPermission('documents.code');
  const canSearch = useMatterPermission('search.run');
  const canUnlock = useMatterPermission('qc.manage');
  const canRedact = useMatterPermission('documents.redact');
  const noteRef = useRef<HTMLTextAreaElement>(null);
  const [legendOpen, setLegendOpen] = useLegendOpen();
  const [undo, setUndo] = useState<Undo | null>(null);
  const [pendingPrivilege, setPendingPrivilege] = useState<{ code: Code; next: number[] } | null>(
    null,
  );
  const [blocked, setBlocked] = useState<string | null>(null);
  const [view, setView] = useState<'pages' | 'text'>('pages');

  const allCodes = useMemo(() => codes.data?.codes ?? [], [codes.data]);
  const groups = useMemo(() => codes.data?.groups ?? [], [codes.data]);
  const active = useMemo(() => activeCodes(allCodes), [allCodes]);
  const keyMap = useMemo(() => codeKeyMap(active), [active]);
  const resultsHref = batchId
    ? `/matters/${matterId}/batches`
    : fromSearch
      ? searchHref(matterId, {
          ...fromSearch,
          pageIndex: position !== null ? Math.floor(position / fromSearch.pageSize) : 0,
        })
      : `/matters/${matterId}/search`;

  const save = useCallback(
    (ids: number[], privilege?: PrivilegeFieldsReq) => {
      const next = ids.map((id) => {
        const c = allCodes.find((x) => x.id === id);
        return { id, name: c?.name ?? String(id) };
      });
      coding.mutate({ documentId: docId, codes: next, privilege });
    },
    [allCodes, coding, docId],
  );

  /** The shared rule (chooseCode): a second choice in a one-choice group replaces the first. */
  function choose(code: Code, data: ReviewResponse) {
    if (!canCode || data.document.locked) return;
    const current = data.codes.map((c) => c.id);
    const { next, removed, replaced } = chooseCode(allCodes, groups, current, code.id);
    const gone = removed ?? replaced;
    if (
      code.marksPrivileged &&
      removed === null &&
      !(data.privilege?.type && data.privilege.basis)
    ) {
      setPendingPrivilege({ code, next });
      return;
    }
    save(next);
    setBlocked(null);
    if (gone !== null) {
      const name = allCodes.find((c) => c.id === gone)?.name ?? '';
      setUndo({
        message: replaced !== null ? `${code.name} replaced ${name}` : `Removed ${name}`,
        codeIds: current,
      });
    }
  }

  function goNext(data: ReviewResponse | undefined) {
    if (!nav?.nextHref) return;
    if (batchId !== null && data && canCode) {
      const missing = missingRequiredGroups(
        allCodes,
        groups,
        data.codes.map((c) => c.id),
      );
      if (missing.length > 0) {
        setBlocked(`Code ${missing.map((g) => g.name).join(' and ')} before moving on.`);
        return;
      }
    }
    navigate(nav.nextHref);
  }

  function moreLike(target: { documentId?: number; passage?: string }) {
    const base: SearchState = {
      query: '',
      mode: 'concept',
      filters: fromSearch?.filters ?? {},
      pageIndex: 0,
      pageSize: fromSearch?.pageSize ?? 50,
      likeDocumentId: target.documentId,
      passage: target.passage,
    };
    navigate(searchHref(matterId, base));
  }

  // The keyboard map (see features/review/keyboard.ts); never while typing in a field.
  const latest = useRef({ review: review.data, nav, keyMap, undo });
  latest.current = { review: review.data, nav, keyMap, undo };
  useEffect(() => {
    function onKey(event: KeyboardEvent) {
      if (event.defaultPrevented || event.ctrlKey || event.metaKey || event.altKey) return;
      if (isTypingTarget(event.target)) return;
      const { review: data, nav: where, keyMap: keys, undo: last } = latest.current;
      const key = event.key.length === 1 ? event.key.toLowerCase() : event.key;
      if (key === 'j' || key === 'ArrowRight') {
        event.preventDefault();
        goNext(data);
      } else if ((key === 'k' || key === 'ArrowLeft') && where?.previousHref) {
        event.preventDefault();
        navigate(where.previousHref);
      } else if (key === 'Escape') {
        navigate(resultsHref);
      } else if (key === '?') {
        setLegendOpen((open) => !open);
      } else if (key === 'u' && last) {
        event.preventDefault();
        save(last.codeIds);
        setUndo(null);
      } else if (key === 't') {
        setView((v) => (v === 'pages' ? 'text' : 'pages'));
      } else if (key === 'n' && canCode) {
        event.preventDefault();
        noteRef.current?.focus();
      } else if (key === 'm' && canSearch) {
        moreLike({ documentId: docId });
      } else if (data && keys.has(key) && !event.repeat) {
        event.preventDefault();
        choose(keys.get(key) as Code, data);
      }
    }
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  });

  if (review.isPending) return <SkeletonRows rows={12} label="Opening the document" />;
  if (review.isError) {
    if (isApiError(review.error) && review.error.status === 404)
      return <MissingDocument matterId={matterId} />;
    return (
      <ErrorPanel
        error={review.error}
        title="The document could not be opened"
        onRetry={() => void review.refetch()}
      />
    );
  }
  const data = review.data;
  const doc = data.document;
  const privilegeCodeIds = new Set(allCodes.filter((c) => c.marksPrivileged).map((c) => c.id));
  const privileged = data.codes.some((c) => privilegeCodeIds.has(c.id));
  const missing = missingRequiredGroups(
    allCodes,
    groups,
    data.codes.map((c) => c.id),
  );
  const keepSearch = batchId
    ? `?batch=${batchId}`
    : fromSearch
      ? `?q=${encodeURIComponent(highlight.q ?? '')}&mode=${state.mode}`
      : '';
  const isPdf = doc.docType === 'pdf' || doc.mime === 'application/pdf';
  const isEmail = doc.docType === 'email';

  return (
    <div data-testid="review-page" data-document-id={doc.id}>
      <PageHeader
        eyebrow={
          <span className="flex flex-wrap items-center gap-3">
            <Link
              to={resultsHref}
              className="text-accent-strong underline-offset-2 hover:underline"
              data-testid="back-to-results"
            >
              ← {batchId ? 'Batches' : fromSearch ? 'Results' : 'Search'}
            </Link>
            <span className="font-mono" data-testid="review-control-number">
              {doc.controlNumber}
            </span>
            {batchNav ? <span data-testid="review-batch">{batchNav.batchName}</span> : null}
            {nav ? (
              <span className="tabular-nums" data-testid="review-position">
                {nav.position + 1} of {nav.total.toLocaleString()}
              </span>
            ) : null}
          </span>
        }
        title={data.text.title || doc.title || doc.name}
        actions={
          nav ? (
            <span className="flex gap-2">
              <NavButton
                onClick={nav.previousHref ? () => navigate(nav.previousHref!) : null}
                label="Previous"
                keys="k"
                testId="review-previous"
              />
              <NavButton
                onClick={nav.nextHref ? () => goNext(data) : null}
                label="Next"
                keys="j"
                testId="review-next"
              />
            </span>
          ) : null
        }
      />
      <ReviewCaution className="mb-4" compact />
      {blocked ? (
        <Notice tone="warn" className="mb-3" title="Required codes missing">
          <span data-testid="blocked-notice">{blocked}</span>
        </Notice>
      ) : null}
      <div className="grid gap-5 lg:grid-cols-[minmax(0,1fr)_20rem]">
        <div className="min-w-0">
          {isEmail ? <EmailHeader doc={doc} subject={data.text.title || doc.title} /> : null}
          {isPdf ? (
            <div className="mb-2 flex gap-1" role="group" aria-label="How to show the document">
              {(['pages', 'text'] as const).map((v) => (
                <button
                  key={v}
                  type="button"
                  aria-pressed={view === v}
                  onClick={() => setView(v)}
                  className={`rounded-md border px-2.5 py-1 text-[13px] ${view === v ? 'border-accent-strong bg-accent-soft font-semibold' : 'border-line-strong bg-panel'}`}
                  data-testid={`view-${v}`}
                >
                  {v === 'pages' ? 'Pages' : 'Extracted text'}
                </button>
              ))}
              <span className="ml-2 self-center text-xs text-ink-faint">
                <kbd>t</kbd> switches
              </span>
            </div>
          ) : null}
          {isPdf && view === 'pages' ? (
            <PdfPages url={documentOriginalHref(matterId, doc.id)} />
          ) : (
            <ReviewText
              title={data.text.title}
              body={data.text.body}
              truncated={data.text.truncated}
              highlights={data.highlights}
              conceptTerms={data.conceptTerms}
              onMoreLikePassage={(passage) => moreLike({ passage })}
            />
          )}
        </div>
        <aside className="space-y-4" aria-label="Coding and details">
          <CodingPanel
            active={active}
            groups={groups}
            applied={data.codes}
            keyMap={keyMap}
            canCode={canCode}
            locked={doc.locked}
            missing={missing}
            onChoose={(code) => choose(code, data)}
            mutation={coding}
            pendingPrivilege={pendingPrivilege?.code ?? null}
            onPrivilege={(fields) => {
              if (pendingPrivilege) save(pendingPrivilege.next, fields);
              setPendingPrivilege(null);
            }}
            onCancelPrivilege={() => setPendingPrivilege(null)}
          />
          {doc.locked && canUnlock ? (
            <button
              type="button"
              className="text-[13px] text-accent-strong underline"
              onClick={() => unlock.mutate(doc.id)}
              data-testid="unlock-coding"
            >
              Unlock this document's coding
            </button>
          ) : null}
          {privileged ? (
            <PrivilegePanel
              matterId={matterId}
              docId={doc.id}
              entry={data.privilege}
              canEdit={canCode && !doc.locked}
            />
          ) : null}
          <NotesPanel
            matterId={matterId}
            docId={doc.id}
            notes={data.notes}
            canAdd={canCode}
            inputRef={noteRef}
          />
          <section
            className="rounded-md border border-line bg-panel p-3"
            aria-labelledby="meta-heading"
          >
            <h2 id="meta-heading" className="mb-2 text-sm font-semibold">
              Document
            </h2>
            <dl className="grid grid-cols-[5.5rem_minmax(0,1fr)] gap-x-2 gap-y-1 text-[13px]">
              <Meta
                label="Control no."
                value={<span className="font-mono">{doc.controlNumber}</span>}
              />
              <Meta label="Custodian" value={doc.custodian?.name ?? '—'} />
              {isEmail ? null : <Meta label="Author" value={doc.author || '—'} />}
              {isEmail || !doc.recipients ? null : (
                <Meta label="Recipients" value={doc.recipients} />
              )}
              <Meta label="Date" value={formatDateTime(doc.sentAt)} />
              <Meta label="Type" value={docTypeLabel(doc.docType)} />
              <Meta label="File" value={<span className="break-all">{doc.name}</span>} />
              <Meta
                label="Size"
                value={`${formatBytes(doc.size)}${doc.pageCount ? ` · ${plural(doc.pageCount, 'page')}` : ''}`}
              />
            </dl>
            <div className="mt-3 flex flex-wrap gap-2">
              <a
                href={documentOriginalHref(matterId, doc.id)}
                download
                className="inline-flex h-7 items-center rounded-md border border-line-strong bg-panel px-2.5 text-[13px] font-medium hover:bg-sunk"
                data-testid="download-original"
              >
                Download original
              </a>
              {canSearch ? (
                <button
                  type="button"
                  onClick={() => moreLike({ documentId: doc.id })}
                  className="inline-flex h-7 items-center gap-1.5 rounded-md border border-line-strong bg-panel px-2.5 text-[13px] font-medium hover:bg-sunk"
                  data-testid="more-like-document"
                >
                  More like this <kbd className="font-mono text-[11px] text-ink-faint">m</kbd>
                </button>
              ) : null}
            </div>
          </section>
          <RedactionPanel
            matterId={matterId}
            documentId={doc.id}
            body={data.text.body}
            isPdf={doc.mime === 'application/pdf'}
            canRedact={canRedact}
          />
          {/* Slot: the document metadata panel (metadata feature) is added on this line. */}
          <Family matterId={matterId} data={data} suffix={keepSearch} />
          <KeyLegend
            keyMap={keyMap}
            hasPosition={nav !== null}
            open={legendOpen}
            onToggle={() => setLegendOpen((o) => !o)}
          />
        </aside>
      </div>
      {undo ? (
        <UndoToast
          message={undo.message}
          onUndo={() => {
            save(undo.codeIds);
            setUndo(null);
          }}
          onDone={() => setUndo(null)}
        />
      ) : null}
    </div>
  );
}

function NavButton({
  onClick,
  label,
  keys,
  testId,
}: {
  onClick: (() => void) | null;
  label: string;
  keys: string;
  testId: string;
}) {
  const className =
    'inline-flex h-9 items-center gap-2 rounded-md border border-line-strong bg-panel px-3 text-sm font-medium';
  if (!onClick)
    return (
      <span className={`${className} cursor-not-allowed opacity-55`} aria-disabled="true">
        {label}
      </span>
    );
  return (
    <button
      type="button"
      onClick={onClick}
      className={`${className} hover:bg-sunk`}
      data-testid={testId}
    >
      {label} <kbd className="font-mono text-[11px] text-ink-faint">{keys}</kbd>
    </button>
  );
}

function Meta({ label, value }: { label: string; value: React.ReactNode }) {
  return (
    <>
      <dt className="text-ink-muted">{label}</dt>
      <dd className="min-w-0">{value}</dd>
    </>
  );
}

/** The family: the parent e-mail and the attachments as links into it; exact copies. */
function Family({
  matterId,
  data,
  suffix,
}: {
  matterId: number;
  data: ReviewResponse;
  suffix: string;
}) {
  const { parent, attachments } = data.family;
  if (!parent && attachments.length === 0 && data.duplicates.length === 0) return null;
  const link = (ref: { id: number; controlNumber: string; title: string; name: string }) => (
    <Link
      to={`/matters/${matterId}/review/${ref.id}${suffix}`}
      className="text-accent-strong hover:underline"
      data-testid="family-link"
    >
      <span className="font-mono">{ref.controlNumber}</span> {ref.title || ref.name}
    </Link>
  );
  return (
    <section
      className="rounded-md border border-line bg-panel p-3 text-[13px]"
      aria-labelledby="family-heading"
      data-testid="family"
    >
      <h2 id="family-heading" className="mb-2 text-sm font-semibold">
        Family
      </h2>
      {parent ? (
        <p className="mb-1">
          <Badge>Parent</Badge> {link(parent)}
        </p>
      ) : null}
      {attachments.length > 0 ? (
        <div>
          <p className="text-xs text-ink-muted">{plural(attachments.length, 'attachment')}</p>
          <ul className="mt-1 space-y-0.5">
            {attachments.map((a) => (
              <li key={a.id}>↳ {link(a)}</li>
            ))}
          </ul>
        </div>
      ) : null}
      {data.duplicates.length > 0 ? (
        <div className="mt-2">
          <p className="text-xs text-ink-muted">
            {plural(data.duplicates.length, 'exact copy', 'exact copies')}
          </p>
          <ul className="mt-1 space-y-0.5">
            {data.duplicates.map((d) => (
              <li key={d.id}>{link(d)}</li>
            ))}
          </ul>
        </div>
      ) : null}
    </section>
  );
}
