import type { Job } from '@shared/schemas/jobs';
import { Badge } from '@/components/ui';
import { formatDateTime } from '@/lib/format';
import { isJobActive } from '../api/get-matter-jobs';
import { ProgressBar } from './progress-bar';

export const JOB_KIND_LABELS: Record<Job['kind'], string> = {
  'extract-batch': 'Text extraction',
  'build-index': 'Concept index build',
  'build-production': 'Production build',
  'concept-grouping': 'Concept grouping',
};

const STATUS_LABELS: Record<Job['status'], string> = {
  queued: 'Queued',
  running: 'Running',
  succeeded: 'Done',
  failed: 'Failed',
  cancelled: 'Cancelled',
};

const STATUS_TONES = {
  queued: 'neutral',
  running: 'info',
  succeeded: 'ok',
  failed: 'danger',
  cancelled: 'warn',
} as const;

/** What a job's progress counts: files for extraction, percent for an index build. */
function progressText(job: Job): string {
  if (job.total <= 0) return isJobActive(job) ? 'Starting…' : '';
  if (job.kind === 'build-index') return `${Math.round((job.progress / job.total) * 100)}%`;
  return `${job.progress} of ${job.total} ${job.total === 1 ? 'file' : 'files'}`;
}

/** One background job: what it is, where it stands, its message or its error. */
export function JobProgress({ job, title }: { job: Job; title?: string }) {
  const label = title ?? JOB_KIND_LABELS[job.kind];
  const active = isJobActive(job);
  const settledValue = job.status === 'succeeded' ? 1 : job.total > 0 ? job.progress : 0;
  return (
    <div
      className="space-y-1.5"
      data-testid={`job-${job.id}`}
      data-job-kind={job.kind}
      data-job-status={job.status}
    >
      <div className="flex flex-wrap items-baseline justify-between gap-2 text-[13px]">
        <span className="font-medium text-ink">{label}</span>
        <span className="flex items-center gap-2 text-ink-muted">
          <span className="tabular-nums">{progressText(job)}</span>
          <Badge tone={STATUS_TONES[job.status]}>{STATUS_LABELS[job.status]}</Badge>
        </span>
      </div>
      <ProgressBar
        label={`${label} progress`}
        value={active && job.total <= 0 ? null : job.status === 'succeeded' ? 1 : settledValue}
        max={job.status === 'succeeded' ? 1 : Math.max(job.total, 1)}
        valueText={`${STATUS_LABELS[job.status]}${progressText(job) ? `, ${progressText(job)}` : ''}`}
        tone={job.status === 'failed' ? 'danger' : job.status === 'succeeded' ? 'ok' : 'accent'}
        testId={`job-progress-${job.id}`}
      />
      {job.status === 'failed' && job.error ? (
        <p className="text-xs text-danger" role="alert">
          {job.error}
        </p>
      ) : job.message && active ? (
        <p className="truncate text-xs text-ink-muted" aria-live="polite">
          {job.message}
        </p>
      ) : job.finishedAt ? (
        <p className="text-xs text-ink-muted">Finished {formatDateTime(job.finishedAt)}</p>
      ) : null}
    </div>
  );
}
