import { type FormEvent, useState } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import type { QcMethod } from '@shared/schemas/qc';
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
import { useTeamProgress } from '@/features/batches/api/get-team-progress';
import { useCodes } from '@/features/codes/api/get-codes';
import { useCreateQcSample } from '../api/create-qc-sample';
import { useDecideQcItem } from '../api/decide-qc-item';
import { useOverturnRates } from '../api/get-overturn-rates';
import { useQcSample } from '../api/get-qc-sample';
import { useQcSamples } from '../api/get-qc-samples';

const pct = (r: number | null) => (r === null ? '—' : `${(r * 100).toFixed(1)}%`);

/** Second-level review: draw samples (lead), confirm or overturn calls, overturn rates. */
export function QcPage({ matterId }: { matterId: number }) {
  const [params] = useSearchParams();
  const sampleId = Number(params.get('sample')) || null;
  const canManage = useMatterPermission('qc.manage');
  return (
    <div data-testid="qc-page">
      <PageHeader
        title="Quality control"
        description="A second look at first-level calls. Checked documents are locked until the matter lead unlocks them; every step is in the activity log."
      />
      <ReviewCaution className="mb-4" compact />
      {sampleId ? <SampleCalls matterId={matterId} sampleId={sampleId} /> : null}
      {canManage ? (
        <>
          <DrawSample matterId={matterId} />
          <Samples matterId={matterId} />
          <Rates matterId={matterId} />
        </>
      ) : sampleId ? null : (
        <Notice tone="info">Open a quality-control batch from your batches.</Notice>
      )}
    </div>
  );
}

function DrawSample({ matterId }: { matterId: number }) {
  const codes = useCodes(matterId);
  const people = useTeamProgress(matterId, true);
  const draw = useCreateQcSample(matterId);
  const [method, setMethod] = useState<QcMethod>('share');
  const [share, setShare] = useState('10');
  const [count, setCount] = useState('20');
  const [seed, setSeed] = useState('');
  const [reviewerId, setReviewerId] = useState('');
  const [codeId, setCodeId] = useState('');
  function submit(event: FormEvent) {
    event.preventDefault();
    draw.mutate({
      method,
      ...(method === 'share' ? { share: Number(share) / 100 } : {}),
      ...(method === 'count' ? { count: Number(count) } : {}),
      ...(method !== 'targeted' && seed !== '' ? { seed: Number(seed) } : {}),
      criteria: {
        ...(reviewerId ? { reviewerId } : {}),
        ...(codeId ? { codeId: Number(codeId) } : {}),
      },
    });
  }
  return (
    <section className="mb-6 rounded-md border border-line bg-panel p-3" aria-labelledby="draw">
      <h2 id="draw" className="mb-2 text-base font-semibold">
        Draw a sample
      </h2>
      <form
        onSubmit={submit}
        className="grid gap-2 text-[13px] sm:grid-cols-3"
        data-testid="qc-draw"
      >
        <label>
          <span className="text-ink-muted">How</span>
          <select
            className={inputClass}
            value={method}
            onChange={(e) => setMethod(e.target.value as QcMethod)}
          >
            <option value="share">A random share</option>
            <option value="count">A random number of documents</option>
            <option value="targeted">Every matching call (targeted)</option>
          </select>
        </label>
        {method === 'share' ? (
          <label>
            <span className="text-ink-muted">Share (%)</span>
            <input
              className={inputClass}
              type="number"
              min={0.1}
              max={100}
              step={0.1}
              value={share}
              onChange={(e) => setShare(e.target.value)}
            />
          </label>
        ) : null}
        {method === 'count' ? (
          <label>
            <span className="text-ink-muted">Documents</span>
            <input
              className={inputClass}
              type="number"
              min={1}
              value={count}
              onChange={(e) => setCount(e.target.value)}
            />
          </label>
        ) : null}
        {method !== 'targeted' ? (
          <label>
            <span className="text-ink-muted">Seed (empty: a new one, recorded)</span>
            <input
              className={inputClass}
              type="number"
              min={0}
              value={seed}
              onChange={(e) => setSeed(e.target.value)}
            />
          </label>
        ) : null}
        <label>
          <span className="text-ink-muted">Calls by</span>
          <select
            className={inputClass}
            value={reviewerId}
            onChange={(e) => setReviewerId(e.target.value)}
          >
            <option value="">Any reviewer</option>
            {(people.data?.assignable ?? []).map((p) => (
              <option key={p.id} value={p.id}>
                {p.name}
              </option>
            ))}
          </select>
        </label>
        <label>
          <span className="text-ink-muted">Code</span>
          <select className={inputClass} value={codeId} onChange={(e) => setCodeId(e.target.value)}>
            <option value="">Any code</option>
            {(codes.data?.codes ?? []).map((c) => (
              <option key={c.id} value={c.id}>
                {c.name}
              </option>
            ))}
          </select>
        </label>
        <div className="sm:col-span-3">
          <Button type="submit" variant="primary" disabled={draw.isPending}>
            Draw into a QC batch
          </Button>
        </div>
      </form>
      {draw.isError ? (
        <Notice tone="danger" className="mt-2" title="No sample drawn">
          {describeError(draw.error)}
        </Notice>
      ) : null}
      {draw.data ? (
        <Notice tone="info" className="mt-2" title={`${draw.data.sample.size} documents drawn`}>
          From {draw.data.sample.population} documents
          {draw.data.sample.seed !== null ? `, seed ${draw.data.sample.seed}` : ''}. Assign the
          batch “{draw.data.sample.batchName}” on the Batches page.
        </Notice>
      ) : null}
    </section>
  );
}

function Samples({ matterId }: { matterId: number }) {
  const samples = useQcSamples(matterId);
  return (
    <section className="mb-6" aria-labelledby="samples">
      <h2 id="samples" className="mb-2 text-base font-semibold">
        Samples
      </h2>
      <QueryBoundary query={samples} errorTitle="Samples could not be loaded">
        {(data) =>
          data.samples.length === 0 ? (
            <EmptyState title="No samples yet">Draw one above.</EmptyState>
          ) : (
            <Table caption="QC samples">
              <THead>
                <Tr>
                  <Th>Batch</Th>
                  <Th>How</Th>
                  <Th>Seed</Th>
                  <Th>Documents</Th>
                  <Th>Calls decided</Th>
                  <Th>Drawn</Th>
                </Tr>
              </THead>
              <TBody>
                {data.samples.map((s) => (
                  <Tr key={s.id}>
                    <Td>
                      <Link className="text-accent-strong underline" to={`?sample=${s.id}`}>
                        {s.batchName}
                      </Link>
                    </Td>
                    <Td>
                      {s.method === 'share'
                        ? `${(s.share! * 100).toFixed(1)}% random`
                        : s.method === 'count'
                          ? `${s.requested} random`
                          : 'Targeted'}
                    </Td>
                    <Td className="tabular-nums">{s.seed ?? '—'}</Td>
                    <Td className="tabular-nums">
                      {s.size} of {s.population}
                    </Td>
                    <Td className="tabular-nums">
                      {s.decided} of {s.calls}
                    </Td>
                    <Td className="text-[13px] text-ink-muted">{formatDateTime(s.createdAt)}</Td>
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

function SampleCalls({ matterId, sampleId }: { matterId: number; sampleId: number }) {
  const sample = useQcSample(matterId, sampleId);
  const codes = useCodes(matterId);
  const decide = useDecideQcItem(matterId);
  const [replacement, setReplacement] = useState<Record<number, string>>({});
  return (
    <section className="mb-6" aria-labelledby="calls" data-testid="qc-calls">
      <h2 id="calls" className="mb-2 text-base font-semibold">
        Calls to check
      </h2>
      {decide.isError ? (
        <Notice tone="danger" className="mb-2" title="Not recorded">
          {describeError(decide.error)}
        </Notice>
      ) : null}
      <QueryBoundary query={sample} errorTitle="The sample could not be loaded">
        {(data) => (
          <Table caption={data.sample.batchName} captionVisible>
            <THead>
              <Tr>
                <Th>Document</Th>
                <Th>Call</Th>
                <Th>By</Th>
                <Th>Verdict</Th>
              </Tr>
            </THead>
            <TBody>
              {data.items.map((item) => {
                const code = codes.data?.codes.find((c) => c.id === item.code.id);
                const siblings = (codes.data?.codes ?? []).filter(
                  (c) => c.groupId === code?.groupId && c.id !== code?.id && !c.archivedAt,
                );
                return (
                  <Tr key={item.id} data-testid="qc-item">
                    <Td>
                      <Link
                        className="text-accent-strong underline"
                        to={`/matters/${matterId}/review/${item.documentId}`}
                      >
                        <span className="font-mono">{item.controlNumber}</span> {item.title}
                      </Link>
                    </Td>
                    <Td>{item.code.name}</Td>
                    <Td>{item.firstCoder?.name ?? '—'}</Td>
                    <Td>
                      {item.verdict ? (
                        <span>
                          {item.verdict === 'confirmed'
                            ? 'Confirmed'
                            : `Overturned${item.replacementCode ? ` → ${item.replacementCode.name}` : ''}`}
                        </span>
                      ) : (
                        <span className="flex flex-wrap items-center gap-2">
                          <Button
                            size="sm"
                            onClick={() => decide.mutate({ itemId: item.id, verdict: 'confirmed' })}
                          >
                            Confirm
                          </Button>
                          <select
                            aria-label="Replace with"
                            className={`${inputClass} w-40`}
                            value={replacement[item.id] ?? ''}
                            onChange={(e) =>
                              setReplacement({ ...replacement, [item.id]: e.target.value })
                            }
                          >
                            <option value="">Remove the code</option>
                            {siblings.map((c) => (
                              <option key={c.id} value={c.id}>
                                Replace with {c.name}
                              </option>
                            ))}
                          </select>
                          <Button
                            size="sm"
                            variant="danger"
                            onClick={() =>
                              decide.mutate({
                                itemId: item.id,
                                verdict: 'overturned',
                                replacementCodeId: replacement[item.id]
                                  ? Number(replacement[item.id])
                                  : null,
                              })
                            }
                          >
                            Overturn
                          </Button>
                        </span>
                      )}
                    </Td>
                  </Tr>
                );
              })}
            </TBody>
          </Table>
        )}
      </QueryBoundary>
    </section>
  );
}

function Rates({ matterId }: { matterId: number }) {
  const rates = useOverturnRates(matterId);
  return (
    <section aria-labelledby="rates" data-testid="qc-rates">
      <h2 id="rates" className="mb-2 text-base font-semibold">
        Overturn rates
      </h2>
      <QueryBoundary query={rates} errorTitle="Rates could not be loaded">
        {(data) => (
          <div className="grid gap-4 md:grid-cols-2">
            <Table caption="Per reviewer" captionVisible>
              <THead>
                <Tr>
                  <Th>Reviewer</Th>
                  <Th>Checked</Th>
                  <Th>Overturned</Th>
                  <Th>Rate</Th>
                </Tr>
              </THead>
              <TBody>
                {data.byReviewer.map((r) => (
                  <Tr key={r.reviewer.id}>
                    <Td>{r.reviewer.name}</Td>
                    <Td className="tabular-nums">{r.checked}</Td>
                    <Td className="tabular-nums">{r.overturned}</Td>
                    <Td className="tabular-nums">{pct(r.rate)}</Td>
                  </Tr>
                ))}
              </TBody>
            </Table>
            <Table caption="Per code" captionVisible>
              <THead>
                <Tr>
                  <Th>Code</Th>
                  <Th>Checked</Th>
                  <Th>Overturned</Th>
                  <Th>Rate</Th>
                </Tr>
              </THead>
              <TBody>
                {data.byCode.map((r) => (
                  <Tr key={r.code.id}>
                    <Td>{r.code.name}</Td>
                    <Td className="tabular-nums">{r.checked}</Td>
                    <Td className="tabular-nums">{r.overturned}</Td>
                    <Td className="tabular-nums">{pct(r.rate)}</Td>
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
