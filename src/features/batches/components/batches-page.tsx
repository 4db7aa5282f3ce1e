import { type FormEvent, useState } from 'react';
import { useNavigate } from 'react-router-dom';
import {
  BATCH_KIND_LABELS,
  BATCH_SIZE_DEFAULT,
  BATCH_STATE_LABELS,
  type Batch,
} from '@shared/schemas/batches';
import type { SearchMode } from '@shared/schemas/search';
import { ReviewCaution } from '@/components/review-caution';
import {
  Button,
  EmptyState,
  Notice,
  PageHeader,
  QueryBoundary,
  TBody,
  THead,
  Table,
  Td,
  Th,
  Tr,
  describeError,
  inputClass,
} from '@/components/ui';
import { useMatterPermission } from '@/lib/authorization';
import { formatDateTime } from '@/lib/format';
import { useSavedSearches } from '@/features/saved-searches/api/get-saved-searches';
import { useAssignBatch } from '../api/assign-batch';
import { useCheckinBatch } from '../api/checkin-batch';
import { useCheckoutBatch } from '../api/checkout-batch';
import { useCreateBatches } from '../api/create-batches';
import { getBatch } from '../api/get-batch';
import { useBatches } from '../api/get-batches';
import { useTeamProgress } from '../api/get-team-progress';

const rate = (n: number | null) => (n === null ? '—' : n.toFixed(1));

function Progress({ batch }: { batch: Batch }) {
  const { documents, complete } = batch.progress;
  const pct = documents ? Math.round((complete / documents) * 100) : 0;
  return (
    <span className="flex items-center gap-2" data-testid="batch-progress">
      <span className="h-2 w-24 overflow-hidden rounded bg-sunk" aria-hidden="true">
        <span className="block h-full bg-accent" style={{ width: `${pct}%` }} />
      </span>
      <span className="tabular-nums text-[13px]">
        {complete} of {documents} done
      </span>
    </span>
  );
}

/** Batches: a reviewer's own ("My batches"); for leads and attorneys, cutting, assigning and team progress. */
export function BatchesPage({ matterId }: { matterId: number }) {
  const canManage = useMatterPermission('batches.manage');
  return (
    <div data-testid="batches-page">
      <PageHeader
        title="Batches"
        description="Work handed out in fixed, ordered sets. Families stay together; a document is in one open batch at a time."
      />
      <ReviewCaution className="mb-4" compact />
      <MyBatches matterId={matterId} />
      {canManage ? (
        <>
          <CutBatches matterId={matterId} />
          <TeamProgress matterId={matterId} />
        </>
      ) : null}
    </div>
  );
}

function MyBatches({ matterId }: { matterId: number }) {
  const mine = useBatches(matterId, { mine: true });
  const checkout = useCheckoutBatch(matterId);
  const checkin = useCheckinBatch(matterId);
  const navigate = useNavigate();

  async function open(batch: Batch) {
    if (batch.state !== 'checked_out') await checkout.mutateAsync({ batchId: batch.id });
    const { documents } = await getBatch(matterId, batch.id);
    const next = documents.find((d) => !d.complete) ?? documents[0];
    if (next) navigate(`/matters/${matterId}/review/${next.id}?batch=${batch.id}`);
  }

  return (
    <section className="mb-6" aria-labelledby="my-batches">
      <h2 id="my-batches" className="mb-2 text-base font-semibold">
        My batches
      </h2>
      {checkin.isError || checkout.isError ? (
        <Notice tone="danger" className="mb-2" title="Not done">
          <span data-testid="batch-error">{describeError(checkin.error ?? checkout.error)}</span>
        </Notice>
      ) : null}
      <QueryBoundary query={mine} errorTitle="Your batches could not be loaded">
        {(data) =>
          data.batches.filter((b) => b.state !== 'checked_in').length === 0 ? (
            <EmptyState title="No open batches">
              Batches assigned to you appear here. Ask the matter lead for the next one.
            </EmptyState>
          ) : (
            <Table caption="My batches">
              <THead>
                <Tr>
                  <Th>Batch</Th>
                  <Th>Kind</Th>
                  <Th>State</Th>
                  <Th>Progress</Th>
                  <Th>Actions</Th>
                </Tr>
              </THead>
              <TBody>
                {data.batches
                  .filter((b) => b.state !== 'checked_in')
                  .map((b) => (
                    <Tr key={b.id} data-testid="my-batch" data-batch-name={b.name}>
                      <Td className="font-medium">{b.name}</Td>
                      <Td>{BATCH_KIND_LABELS[b.kind]}</Td>
                      <Td>{BATCH_STATE_LABELS[b.state]}</Td>
                      <Td>
                        <Progress batch={b} />
                      </Td>
                      <Td className="flex gap-2">
                        {b.kind === 'qc' ? (
                          <Button
                            size="sm"
                            variant="primary"
                            onClick={() =>
                              void (async () => {
                                if (b.state !== 'checked_out')
                                  await checkout.mutateAsync({ batchId: b.id });
                                navigate(`/matters/${matterId}/qc?sample=${b.qcSampleId ?? ''}`);
                              })()
                            }
                          >
                            Open QC calls
                          </Button>
                        ) : (
                          <Button
                            size="sm"
                            variant="primary"
                            onClick={() => void open(b)}
                            data-testid="batch-open"
                          >
                            {b.state === 'checked_out' ? 'Continue' : 'Check out and start'}
                          </Button>
                        )}
                        {b.state === 'checked_out' ? (
                          <Button
                            size="sm"
                            onClick={() => checkin.mutate({ batchId: b.id })}
                            data-testid="batch-checkin"
                          >
                            Check in
                          </Button>
                        ) : null}
                      </Td>
                    </Tr>
                  ))}
              </TBody>
            </Table>
          )
        }
      </QueryBoundary>
    </section>
  );
}

function CutBatches({ matterId }: { matterId: number }) {
  const saved = useSavedSearches(matterId);
  const create = useCreateBatches(matterId);
  const [source, setSource] = useState<'search' | 'saved'>('search');
  const [query, setQuery] = useState('');
  const [mode, setMode] = useState<SearchMode>('hybrid');
  const [uncodedOnly, setUncodedOnly] = useState(true);
  const [savedId, setSavedId] = useState('');
  const [size, setSize] = useState(String(BATCH_SIZE_DEFAULT));
  const [keepFamilies, setKeepFamilies] = useState(true);
  const [name, setName] = useState('');

  function submit(event: FormEvent) {
    event.preventDefault();
    create.mutate({
      ...(source === 'saved'
        ? { savedSearchId: Number(savedId) }
        : { search: { query, mode, filters: uncodedOnly ? { uncodedOnly: true } : {} } }),
      size: Number(size),
      keepFamilies,
      ...(name.trim() ? { name: name.trim() } : {}),
    });
  }

  return (
    <section className="mb-6 rounded-md border border-line bg-panel p-3" aria-labelledby="cut">
      <h2 id="cut" className="mb-2 text-base font-semibold">
        Cut batches
      </h2>
      <form
        onSubmit={submit}
        className="grid gap-2 text-[13px] sm:grid-cols-2"
        data-testid="cut-batches"
      >
        <label className="block">
          <span className="text-ink-muted">From</span>
          <select
            className={inputClass}
            value={source}
            onChange={(e) => setSource(e.target.value as 'search' | 'saved')}
          >
            <option value="search">A search</option>
            <option value="saved">A saved search</option>
          </select>
        </label>
        {source === 'search' ? (
          <>
            <label className="block">
              <span className="text-ink-muted">Query (empty: every document)</span>
              <input
                className={inputClass}
                value={query}
                onChange={(e) => setQuery(e.target.value)}
              />
            </label>
            <label className="block">
              <span className="text-ink-muted">Mode</span>
              <select
                className={inputClass}
                value={mode}
                onChange={(e) => setMode(e.target.value as SearchMode)}
              >
                <option value="hybrid">Hybrid</option>
                <option value="concept">Concept</option>
                <option value="keyword">Keyword</option>
              </select>
            </label>
            <label className="flex items-center gap-2 self-end">
              <input
                type="checkbox"
                checked={uncodedOnly}
                onChange={(e) => setUncodedOnly(e.target.checked)}
              />
              Uncoded documents only
            </label>
          </>
        ) : (
          <label className="block">
            <span className="text-ink-muted">Saved search</span>
            <select
              className={inputClass}
              value={savedId}
              onChange={(e) => setSavedId(e.target.value)}
              required
            >
              <option value="">Choose…</option>
              {(saved.data?.savedSearches ?? []).map((s) => (
                <option key={s.id} value={s.id}>
                  {s.name}
                </option>
              ))}
            </select>
          </label>
        )}
        <label className="block">
          <span className="text-ink-muted">Documents per batch (at most)</span>
          <input
            className={inputClass}
            type="number"
            min={1}
            max={1000}
            value={size}
            onChange={(e) => setSize(e.target.value)}
            data-testid="batch-size"
          />
        </label>
        <label className="block">
          <span className="text-ink-muted">Name (optional)</span>
          <input
            className={inputClass}
            value={name}
            onChange={(e) => setName(e.target.value)}
            maxLength={70}
          />
        </label>
        <label className="flex items-center gap-2 self-end">
          <input
            type="checkbox"
            checked={keepFamilies}
            onChange={(e) => setKeepFamilies(e.target.checked)}
          />
          Keep families together
        </label>
        <div className="sm:col-span-2">
          <Button
            type="submit"
            variant="primary"
            disabled={create.isPending}
            data-testid="cut-submit"
          >
            Cut batches
          </Button>
        </div>
      </form>
      {create.isError ? (
        <Notice tone="danger" className="mt-2" title="No batches cut">
          {describeError(create.error)}
        </Notice>
      ) : null}
      {create.data ? (
        <Notice tone="info" className="mt-2" title={`${create.data.batches.length} batches cut`}>
          {create.data.skipped > 0
            ? `${create.data.skipped} documents already in an open batch were left out. `
            : ''}
          {create.data.notices.join(' ')}
        </Notice>
      ) : null}
    </section>
  );
}

function TeamProgress({ matterId }: { matterId: number }) {
  const progress = useTeamProgress(matterId, true);
  const assign = useAssignBatch(matterId);
  return (
    <section aria-labelledby="team" data-testid="team-progress">
      <h2 id="team" className="mb-2 text-base font-semibold">
        Team progress
      </h2>
      {assign.isError ? (
        <Notice tone="danger" className="mb-2" title="Not assigned">
          {describeError(assign.error)}
        </Notice>
      ) : null}
      <QueryBoundary query={progress} errorTitle="Progress could not be loaded">
        {(data) => (
          <div className="space-y-4">
            <Table caption="Per reviewer" captionVisible>
              <THead>
                <Tr>
                  <Th>Reviewer</Th>
                  <Th>Batches</Th>
                  <Th>Documents coded</Th>
                  <Th>Hours</Th>
                  <Th>Documents per hour</Th>
                  <Th>Codes given</Th>
                </Tr>
              </THead>
              <TBody>
                {data.reviewers.map((r) => (
                  <Tr
                    key={r.reviewer.id}
                    data-testid="reviewer-progress"
                    data-reviewer={r.reviewer.email}
                  >
                    <Td>{r.reviewer.name}</Td>
                    <Td className="tabular-nums">{r.batches}</Td>
                    <Td className="tabular-nums" data-testid="reviewer-coded">
                      {r.documentsCoded}
                    </Td>
                    <Td className="tabular-nums">{r.hours.toFixed(2)}</Td>
                    <Td className="tabular-nums">{rate(r.documentsPerHour)}</Td>
                    <Td className="text-[13px]">
                      {r.codesGiven}{' '}
                      <span className="text-ink-muted">
                        (
                        {Object.entries(r.codesByName)
                          .map(([n, c]) => `${n} ${c}`)
                          .join(', ')}
                        )
                      </span>
                    </Td>
                  </Tr>
                ))}
              </TBody>
            </Table>
            <Table caption="Per batch" captionVisible>
              <THead>
                <Tr>
                  <Th>Batch</Th>
                  <Th>Kind</Th>
                  <Th>State</Th>
                  <Th>Assigned to</Th>
                  <Th>Progress</Th>
                  <Th>Documents per hour</Th>
                  <Th>Codes given</Th>
                  <Th>Cut</Th>
                </Tr>
              </THead>
              <TBody>
                {data.batches.map(({ batch, documentsPerHour, codesGiven }) => (
                  <Tr key={batch.id} data-testid="batch-row" data-batch-name={batch.name}>
                    <Td className="font-medium" title={batch.source}>
                      {batch.name}
                    </Td>
                    <Td>{BATCH_KIND_LABELS[batch.kind]}</Td>
                    <Td>{BATCH_STATE_LABELS[batch.state]}</Td>
                    <Td>
                      {batch.state === 'checked_in' ? (
                        (batch.assignee?.name ?? '—')
                      ) : (
                        <select
                          aria-label={`Assign ${batch.name}`}
                          className={inputClass}
                          value={batch.assignee?.id ?? ''}
                          onChange={(e) =>
                            e.target.value &&
                            assign.mutate({ batchId: batch.id, userId: e.target.value })
                          }
                          data-testid="batch-assign"
                        >
                          <option value="">Not assigned</option>
                          {data.assignable.map((p) => (
                            <option key={p.id} value={p.id}>
                              {p.name}
                            </option>
                          ))}
                        </select>
                      )}
                    </Td>
                    <Td>
                      <Progress batch={batch} />
                    </Td>
                    <Td className="tabular-nums">{rate(documentsPerHour)}</Td>
                    <Td className="tabular-nums">{codesGiven}</Td>
                    <Td className="text-[13px] text-ink-muted">
                      {formatDateTime(batch.createdAt)}
                    </Td>
                  </Tr>
                ))}
              </TBody>
            </Table>
          </div>
        )}
      </QueryBoundary>
    </section>
  );
}
