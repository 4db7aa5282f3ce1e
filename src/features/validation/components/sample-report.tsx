import { Link } from 'react-router-dom';
import type { SampleResponse } from '@shared/schemas/validation';
import { ReviewCaution } from '@/components/review-caution';
import { Button, QueryBoundary } from '@/components/ui';
import { formatDateTime } from '@/lib/format';
import { sampleCsvHref, useSample } from '../api/get-sample';
import { KIND_LABELS } from './validation-samples';

const pct = (v: number) => `${(v * 100).toFixed(2)}%`;

function Figures({ s }: { s: SampleResponse }) {
  const rows: [string, string][] = [
    ['Population', `${s.population.toLocaleString('en')} (${s.populationRule})`],
    ['Seed', String(s.seed)],
    ['Confidence, margin', `${pct(s.confidence)}, ± ${pct(s.margin)}`],
    ['Sample size', String(s.size)],
    ['Coded so far', `${s.coded} of ${s.size}`],
    ['Coded Responsive', String(s.responsive)],
  ];
  if (s.rate !== null && s.interval && s.wilson) {
    rows.push([s.kind === 'elusion' ? 'Elusion rate' : 'Prevalence', pct(s.rate)]);
    rows.push(['Clopper-Pearson (exact)', `${pct(s.interval.low)} to ${pct(s.interval.high)}`]);
    rows.push(['Wilson', `${pct(s.wilson.low)} to ${pct(s.wilson.high)}`]);
  }
  if (s.estimatedMissed !== null)
    rows.push([
      'Estimated responsive documents left behind',
      `${s.estimatedMissed.toFixed(1)} (${(s.interval!.low * s.population).toFixed(1)} to ${(s.interval!.high * s.population).toFixed(1)})`,
    ]);
  if (s.estimatedResponsive !== null)
    rows.push([
      'Estimated responsive documents in the collection',
      `${s.estimatedResponsive.toFixed(1)} (${(s.interval!.low * s.population).toFixed(1)} to ${(s.interval!.high * s.population).toFixed(1)})`,
    ]);
  if (s.recall)
    rows.push([
      'Recall estimate',
      `${pct(s.recall.point)} (${pct(s.recall.low)} to ${pct(s.recall.high)}); ${s.produced} coded Responsive when drawn`,
    ]);
  return (
    <dl
      className="grid grid-cols-[max-content_1fr] gap-x-6 gap-y-1 text-sm"
      data-testid="sample-figures"
    >
      {rows.map(([k, v]) => (
        <div key={k} className="contents">
          <dt className="font-medium">{k}</dt>
          <dd className="tabular-nums">{v}</dd>
        </div>
      ))}
    </dl>
  );
}

/** One printable page: the figures, the cautions, and the sampled documents. */
export function SampleReport({ matterId, sampleId }: { matterId: number; sampleId: number }) {
  const sample = useSample(matterId, sampleId, true);
  return (
    <QueryBoundary query={sample} errorTitle="The sample could not be loaded">
      {(s) => (
        <article className="space-y-4 print:text-[11px]" data-testid="sample-report">
          <header className="flex flex-wrap items-baseline justify-between gap-2">
            <div>
              <h1 className="text-lg font-semibold">
                {KIND_LABELS[s.kind]} sample #{s.sampleId}
              </h1>
              <p className="text-sm text-ink-muted">
                Drawn {formatDateTime(s.createdAt)}
                {s.createdBy ? ` by ${s.createdBy}` : ''}
              </p>
            </div>
            <div className="flex gap-2 print:hidden">
              <Button onClick={() => window.print()}>Print</Button>
              <a
                className="text-sm text-accent-strong underline"
                href={sampleCsvHref(matterId, sampleId)}
              >
                Download CSV
              </a>
              <Link
                className="text-sm text-accent-strong underline"
                to={`/matters/${matterId}/validation`}
              >
                All samples
              </Link>
            </div>
          </header>
          <Figures s={s} />
          <p className="text-[13px] text-ink-muted">
            Intervals are over the coded part of the sample, at the sample’s confidence level. The
            recall estimate is found / (found + estimated missed), with the exact interval carried
            through. This method supports, and does not replace, counsel’s certification of the
            production; follow the ESI protocol, court orders and local rules.
          </p>
          <ReviewCaution compact />
          <section aria-label="Sampled documents">
            <h2 className="mb-1 text-sm font-semibold">Sampled documents (draw order)</h2>
            <ol className="columns-2 text-[12px] sm:columns-3 print:columns-4">
              {s.documents.map((d) => (
                <li key={d.documentId} data-testid="sample-document">
                  <Link className="font-mono" to={`/matters/${matterId}/documents/${d.documentId}`}>
                    {d.controlNumber}
                  </Link>{' '}
                  <span className="text-ink-muted">
                    {d.coded ? (d.responsive ? 'Responsive' : 'Not responsive') : 'not coded'}
                  </span>
                </li>
              ))}
            </ol>
          </section>
        </article>
      )}
    </QueryBoundary>
  );
}
