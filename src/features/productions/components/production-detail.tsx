import type { Production } from '@shared/schemas/productions';
import {
  Badge,
  Button,
  Notice,
  TBody,
  THead,
  Table,
  Td,
  Th,
  Tr,
  describeError,
} from '@/components/ui';
import { useJob } from '@/features/jobs/api/get-job';
import { ProgressBar } from '@/features/jobs';
import { formatDateTime } from '@/lib/format';
import { productionDownloadHref, useBuildProduction } from '../api/build-production';
import { useResolveFamily } from '../api/resolve-family';

const STATE_LABELS: Record<Production['state'], string> = {
  draft: 'Not built yet',
  building: 'Building',
  built: 'Built and locked',
  failed: 'Build failed',
};

function BuildProgress({ jobId }: { jobId: number }) {
  const job = useJob(jobId).data?.job;
  if (!job) return null;
  return (
    <ProgressBar
      value={job.total > 0 ? job.progress : null}
      max={job.total}
      label="Production build"
      valueText={job.message}
      testId="production-progress"
    />
  );
}

/** One production: its numbers, the family check, building and the download. */
export function ProductionDetail({
  matterId,
  production,
}: {
  matterId: number;
  production: Production;
}) {
  const resolve = useResolveFamily(matterId, production.id);
  const build = useBuildProduction(matterId, production.id);
  const gaps = production.familyCheck.gaps;
  const counts = production.counts;
  return (
    <section
      className="space-y-3 rounded-md border border-line bg-panel p-4"
      data-testid="production-detail"
    >
      <header className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 className="text-base font-semibold">{production.name}</h2>
        <Badge
          tone={
            production.state === 'built'
              ? 'ok'
              : production.state === 'failed'
                ? 'danger'
                : 'neutral'
          }
        >
          <span data-testid="production-state">{STATE_LABELS[production.state]}</span>
        </Badge>
      </header>
      <dl className="grid grid-cols-2 gap-x-6 gap-y-1 text-sm sm:grid-cols-4">
        <dt className="text-ink-muted">Documents</dt>
        <dd>{counts.documents}</dd>
        <dt className="text-ink-muted">Bates numbers</dt>
        <dd data-testid="production-range">
          {production.batesRange
            ? `${production.batesRange.first} to ${production.batesRange.last}`
            : `from ${production.bates.prefix}${String(production.bates.start).padStart(production.bates.padding, '0')}`}
        </dd>
        {production.state === 'built' ? (
          <>
            <dt className="text-ink-muted">Pages</dt>
            <dd>{counts.pages}</dd>
            <dt className="text-ink-muted">Produced / redacted / withheld / native</dt>
            <dd>
              {counts.produced} / {counts.redacted} / {counts.withheld} / {counts.natives}
            </dd>
            <dt className="text-ink-muted">Built</dt>
            <dd>{formatDateTime(production.builtAt)}</dd>
          </>
        ) : null}
      </dl>
      {production.state === 'built' ? null : gaps.length > 0 ? (
        <div className="space-y-2" data-testid="family-check">
          <Notice
            tone="warn"
            title={`The set would split ${gaps.length} famil${gaps.length === 1 ? 'y member' : 'y members'}`}
          >
            Add each one to the production, or produce a slip sheet in its place, before building.
          </Notice>
          <Table caption="Family members outside the set">
            <THead>
              <tr>
                <Th>Control number</Th>
                <Th>Title</Th>
                <Th>Why it is listed</Th>
                <Th>
                  <span className="sr-only">Actions</span>
                </Th>
              </tr>
            </THead>
            <TBody>
              {gaps.map((gap) => (
                <Tr key={gap.documentId}>
                  <Td className="tabular-nums">{gap.controlNumber}</Td>
                  <Td>{gap.title}</Td>
                  <Td className="text-ink-muted">
                    {gap.relation === 'attachment' ? 'Attachment of' : 'Parent of'}{' '}
                    {gap.ofControlNumber}
                  </Td>
                  <Td className="space-x-2 whitespace-nowrap">
                    <Button size="sm" onClick={() => resolve.mutate({ add: [gap.documentId] })}>
                      Add
                    </Button>
                    <Button
                      size="sm"
                      onClick={() => resolve.mutate({ slipSheet: [gap.documentId] })}
                    >
                      Slip sheet
                    </Button>
                  </Td>
                </Tr>
              ))}
            </TBody>
          </Table>
          <div className="space-x-2">
            <Button
              size="sm"
              onClick={() => resolve.mutate({ add: gaps.map((g) => g.documentId) })}
            >
              Add all
            </Button>
            <Button
              size="sm"
              onClick={() => resolve.mutate({ slipSheet: gaps.map((g) => g.documentId) })}
            >
              Slip-sheet all
            </Button>
          </div>
        </div>
      ) : (
        <p className="text-sm text-ink-muted" data-testid="family-check">
          Family check: no family is split.
        </p>
      )}
      {production.state === 'building' && production.jobId ? (
        <BuildProgress jobId={production.jobId} />
      ) : null}
      {production.error ? (
        <Notice tone="danger" title="The last build failed">
          {production.error}
        </Notice>
      ) : null}
      {resolve.error || build.error ? (
        <Notice tone="danger" title="That did not work">
          {describeError(resolve.error ?? build.error)}
        </Notice>
      ) : null}
      <div className="flex gap-2">
        {production.state === 'draft' || production.state === 'failed' ? (
          <Button
            variant="primary"
            disabled={gaps.length > 0}
            busy={build.isPending}
            onClick={() => build.mutate()}
            data-testid="production-build"
          >
            Build production
          </Button>
        ) : null}
        {production.state === 'built' ? (
          <a
            className="inline-flex h-9 items-center rounded-md border border-accent-strong bg-accent px-3.5 text-sm text-white hover:bg-accent-strong"
            href={productionDownloadHref(matterId, production.id)}
            download
            data-testid="production-download"
          >
            Download zip
          </a>
        ) : null}
      </div>
      {production.zip ? (
        <p className="break-all text-xs text-ink-muted">
          SHA-256 of the zip: <span className="font-mono">{production.zip.sha256}</span>
        </p>
      ) : null}
    </section>
  );
}
