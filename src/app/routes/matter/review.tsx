import type { QueryClient } from '@tanstack/react-query';
import { useEffect, useMemo, useRef, useState } from 'react';
import {
  Link,
  type LoaderFunctionArgs,
  useNavigate,
  useParams,
  useSearchParams,
} from 'react-router-dom';
import { ReviewCaution } from '@/components/review-caution';
import { Badge, ErrorPanel, Notice, PageHeader, SkeletonRows } from '@/components/ui';
import {
  type Code,
  activeCodes,
  codesQueryOptions,
  useCodes,
} from '@/features/codes/api/get-codes';
import { useSetDocumentCodes } from '@/features/codes/api/set-document-codes';
import { documentOriginalHref } from '@/features/documents/api/get-document';
import { docTypeLabel, formatBytes } from '@/features/documents/format';
import {
  type ReviewResponse,
  reviewQueryOptions,
  useReview,
} from '@/features/review/api/get-review';
import { CodingPanel } from '@/features/review/components/coding-panel';
import { KeyLegend } from '@/features/review/components/key-legend';
import { NotesPanel } from '@/features/review/components/notes-panel';
import { PrivilegePanel } from '@/features/review/components/privilege-panel';
import { ReviewText } from '@/features/review/components/review-text';
import { codeKeyMap, isTypingTarget } from '@/features/review/keyboard';
import { useReviewPosition } from '@/features/review/use-review-position';
import {
  type SearchState,
  hasSearch,
  parseSearchState,
  searchHref,
} from '@/features/search/search-state';
import { isApiError } from '@/lib/api-client';
import { RedactionPanel } from '@/features/redactions/components/redaction-panel';
import { useMatterPermission } from '@/lib/authorization';
import { formatDateTime } from '@/lib/format';
import { parseMatterId, useMatterId } from './layout';

function highlightFor(state: SearchState) {
  return {
    q: state.likeDocumentId || state.passage ? undefined : state.query || undefined,
    mode: state.mode,
  };
}

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ params, request }: LoaderFunctionArgs) => {
    const matterId = parseMatterId(params.matterId);
    const docId = parseMatterId(params.docId);
    if (Number.isNaN(matterId) || Number.isNaN(docId)) return null;
    const state = parseSearchState(new URL(request.url).searchParams);
    void queryClient.prefetchQuery(codesQueryOptions(matterId));
    void queryClient.prefetchQuery(reviewQueryOptions(matterId, docId, highlightFor(state)));
    return null;
  };

/** The review screen: one document's text, codes, notes and privilege entry. */
export function ReviewRoute() {
  const matterId = useMatterId();
  const docId = parseMatterId(useParams().docId);
  const allowed = useMatterPermission('documents.read');
  if (!allowed) {
    return (
      <Notice tone="warn" title="Not available to your role">
        Your role does not include reading this matter's documents.
      </Notice>
    );
  }
  if (Number.isNaN(docId)) return <Missing matterId={matterId} />;
  return <ReviewPage key={docId} matterId={matterId} docId={docId} />;
}

function Missing({ matterId }: { matterId: number }) {
  return (
    <Notice tone="warn" title="No such document">
      This matter has no document at that address.{' '}
      <Link className="underline" to={`/matters/${matterId}/search`}>
        Back to search
      </Link>
    </Notice>
  );
}

function ReviewPage({ matterId, docId }: { matterId: number; docId: number }) {
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const state = useMemo(() => parseSearchState(params), [params]);
  const fromSearch = hasSearch(state) ? state : null;
  const rawPos = Number(params.get('pos'));
  const position = fromSearch && Number.isInteger(rawPos) && rawPos >= 0 ? rawPos : null;
  const highlight = highlightFor(state);

  const review = useReview(matterId, docId, highlight);
  const codes = useCodes(matterId);
  const coding = useSetDocumentCodes(matterId);
  const nav = useReviewPosition(matterId, fromSearch, position);
  const canCode = useMatterPermission('documents.code');
  const canRedact = useMatterPermission('documents.redact');
  const canSearch = useMatterPermission('search.run');
  const noteRef = useRef<HTMLTextAreaElement>(null);
  const [legendOpen, setLegendOpen] = useState(true);

  const active = useMemo(() => activeCodes(codes.data?.codes ?? []), [codes.data]);
  const keyMap = useMemo(() => codeKeyMap(active), [active]);
  const resultsHref = fromSearch
    ? searchHref(matterId, {
        ...fromSearch,
        pageIndex: position !== null ? Math.floor(position / fromSearch.pageSize) : 0,
      })
    : `/matters/${matterId}/search`;

  function toggle(code: Code, data: ReviewResponse) {
    if (!canCode) return;
    const on = data.codes.some((c) => c.id === code.id);
    const next = on
      ? data.codes.filter((c) => c.id !== code.id).map(({ id, name }) => ({ id, name }))
      : [...data.codes.map(({ id, name }) => ({ id, name })), { id: code.id, name: code.name }];
    coding.mutate({ documentId: docId, codes: next });
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
  const latest = useRef({ review: review.data, nav, keyMap });
  latest.current = { review: review.data, nav, keyMap };
  useEffect(() => {
    function onKey(event: KeyboardEvent) {
      if (event.defaultPrevented || event.ctrlKey || event.metaKey || event.altKey) return;
      if (isTypingTarget(event.target)) return;
      const { review: data, nav: where, keyMap: keys } = latest.current;
      const key = event.key.length === 1 ? event.key.toLowerCase() : event.key;
      if ((key === 'j' || key === 'ArrowRight') && where?.nextHref) {
        event.preventDefault();
        navigate(where.nextHref);
      } else if ((key === 'k' || key === 'ArrowLeft') && where?.previousHref) {
        event.preventDefault();
        navigate(where.previousHref);
      } else if (key === 'Escape') {
        navigate(resultsHref);
      } else if (key === '?') {
        setLegendOpen((open) => !open);
      } else if (key === 'n' && canCode) {
        event.preventDefault();
        noteRef.current?.focus();
      } else if (key === 'm' && canSearch) {
        moreLike({ documentId: docId });
      } else if (data && keys.has(key) && !event.repeat) {
        event.preventDefault();
        toggle(keys.get(key) as Code, data);
      }
    }
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  });

  if (review.isPending) return <SkeletonRows rows={12} label="Opening the document" />;
  if (review.isError) {
    if (isApiError(review.error) && review.error.status === 404)
      return <Missing matterId={matterId} />;
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
  const privilegeCodeIds = new Set(
    (codes.data?.codes ?? []).filter((c) => c.marksPrivileged).map((c) => c.id),
  );
  const privileged = data.codes.some((c) => privilegeCodeIds.has(c.id));
  const keepSearch = fromSearch
    ? `?q=${encodeURIComponent(highlight.q ?? '')}&mode=${state.mode}`
    : '';

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
              ← {fromSearch ? 'Results' : 'Search'}
            </Link>
            <span className="font-mono" data-testid="review-control-number">
              {doc.controlNumber}
            </span>
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
                href={nav.previousHref}
                label="Previous"
                keys="k"
                testId="review-previous"
              />
              <NavButton href={nav.nextHref} label="Next" keys="j" testId="review-next" />
            </span>
          ) : null
        }
      />
      <ReviewCaution className="mb-4" compact />
      <div className="grid gap-5 lg:grid-cols-[minmax(0,1fr)_20rem]">
        <ReviewText
          title={data.text.title}
          body={data.text.body}
          truncated={data.text.truncated}
          highlights={data.highlights}
          conceptTerms={data.conceptTerms}
          onMoreLikePassage={(passage) => moreLike({ passage })}
        />
        <aside className="space-y-4" aria-label="Coding and details">
          <CodingPanel
            active={active}
            applied={data.codes}
            keyMap={keyMap}
            canCode={canCode}
            onToggle={(code) => toggle(code, data)}
            mutation={coding}
          />
          {privileged ? (
            <PrivilegePanel
              matterId={matterId}
              docId={doc.id}
              entry={data.privilege}
              canEdit={canCode}
            />
          ) : null}
          <RedactionPanel
            matterId={matterId}
            documentId={doc.id}
            body={data.text.body}
            isPdf={doc.mime === 'application/pdf'}
            canRedact={canRedact}
          />
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
              <Meta label="Author" value={doc.author || '—'} />
              <Meta label="Recipients" value={doc.recipients || '—'} />
              <Meta label="Date" value={formatDateTime(doc.sentAt)} />
              <Meta label="Type" value={docTypeLabel(doc.docType)} />
              <Meta label="File" value={<span className="break-all">{doc.name}</span>} />
              <Meta
                label="Size"
                value={`${formatBytes(doc.size)}${doc.pageCount ? ` · ${doc.pageCount} pages` : ''}`}
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
          <Family matterId={matterId} data={data} suffix={keepSearch} />
          {legendOpen ? <KeyLegend keyMap={keyMap} hasPosition={nav !== null} /> : null}
        </aside>
      </div>
    </div>
  );
}

function NavButton({
  href,
  label,
  keys,
  testId,
}: {
  href: string | null;
  label: string;
  keys: string;
  testId: string;
}) {
  const className =
    'inline-flex h-9 items-center gap-2 rounded-md border border-line-strong bg-panel px-3 text-sm font-medium';
  if (!href)
    return (
      <span className={`${className} cursor-not-allowed opacity-55`} aria-disabled="true">
        {label}
      </span>
    );
  return (
    <Link to={href} className={`${className} hover:bg-sunk`} data-testid={testId}>
      {label} <kbd className="font-mono text-[11px] text-ink-faint">{keys}</kbd>
    </Link>
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
          <Badge>Parent e-mail</Badge> {link(parent)}
        </p>
      ) : null}
      {attachments.length > 0 ? (
        <div>
          <p className="text-xs text-ink-muted">Attachments ({attachments.length})</p>
          <ul className="mt-1 space-y-0.5">
            {attachments.map((a) => (
              <li key={a.id}>↳ {link(a)}</li>
            ))}
          </ul>
        </div>
      ) : null}
      {data.duplicates.length > 0 ? (
        <div className="mt-2">
          <p className="text-xs text-ink-muted">Exact copies ({data.duplicates.length})</p>
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
