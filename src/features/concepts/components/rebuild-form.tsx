import { useQueryClient } from '@tanstack/react-query';
import { type FormEvent, useEffect, useId, useState } from 'react';
import type { SpectrumVersion } from '@shared/schemas/concepts';
import {
  INDEX_K_MAX,
  INDEX_WEIGHTINGS,
  type IndexStateResponse,
  indexKError,
  type IndexWeighting,
} from '@shared/schemas/indexing';
import { Button, Notice, Select, describeError, inputClass } from '@/components/ui';
import { fieldErrorOf } from '@/lib/api-client';
import { useIndexState } from '@/features/indexing/api/get-index-state';
import { useRebuildIndex } from '@/features/indexing/api/rebuild-index';
import { useJob } from '@/features/jobs/api/get-job';
import { isJobActive } from '@/features/jobs/api/get-matter-jobs';
import { JobProgress } from '@/features/jobs';
import { conceptsQueryKey } from '../api/keys';
import { formatShare } from '../format';

const WEIGHTING_LABELS: Record<IndexWeighting, string> = {
  'log-entropy': 'Log-entropy (log of the count × global entropy weight)',
  'tf-idf': 'tf-idf (count × inverse document frequency)',
  raw: 'Raw counts',
};

function parseK(
  raw: string,
  buildableDocuments: number,
): { k: number | null; error: string | null } {
  if (raw.trim() === '') return { k: null, error: 'Enter a number of concepts.' };
  const k = Number(raw);
  if (!Number.isInteger(k)) return { k: null, error: 'k must be a whole number.' };
  if (k < 1) return { k: null, error: 'k must be at least 1.' };
  if (k > INDEX_K_MAX) return { k: null, error: `k must be at most ${INDEX_K_MAX}.` };
  const beyond = indexKError(k, buildableDocuments);
  if (beyond) return { k: null, error: `k ${beyond}.` };
  return { k, error: null };
}

/** What the serving version says about a proposed k before anything is rebuilt. */
function energyPreview(current: SpectrumVersion, k: number | null): string | null {
  if (k == null || current.cumulativeEnergy == null || k === current.k) return null;
  if (k < current.k) {
    const share = current.cumulativeEnergy[k - 1];
    return `With k = ${k}, the space would keep ${formatShare(share)} of the energy (this version keeps ${formatShare(current.energyKept)} with k = ${current.k}).`;
  }
  return `With k = ${k}, the space keeps more than this version's ${formatShare(current.energyKept)}; the exact share is known once it is built.`;
}

/**
 * The lead's "try another k" form: asks for a rebuild with a k and a weighting, then
 * follows the build job until the new version serves (the old one serves until then).
 */
export function RebuildForm({
  matterId,
  current,
  onProposedK,
}: {
  matterId: number;
  current: SpectrumVersion;
  onProposedK: (k: number | null) => void;
}) {
  const formId = useId();
  const queryClient = useQueryClient();
  const state = useIndexState(matterId);
  const rebuild = useRebuildIndex(matterId);
  const [rawK, setRawK] = useState(String(current.k));
  const [weighting, setWeighting] = useState<IndexWeighting>(
    (INDEX_WEIGHTINGS as readonly string[]).includes(current.weighting)
      ? (current.weighting as IndexWeighting)
      : 'log-entropy',
  );
  const [touched, setTouched] = useState(false);
  const [jobId, setJobId] = useState<number | null>(null);
  const job = useJob(jobId);

  const { k, error: kError } = parseK(rawK, state.data?.buildableDocuments ?? 0);
  useEffect(() => onProposedK(k), [k, onProposedK]);

  const runningJob = runningBuildJob(state.data);
  const trackedJob = job.data?.job ?? null;
  const shownJob = trackedJob ?? runningJob;
  const busy = rebuild.isPending || (shownJob != null && isJobActive(shownJob));

  // The tracked job has finished: the new version serves now, refetch its figures.
  const settled = trackedJob != null && !isJobActive(trackedJob);
  useEffect(() => {
    if (!settled) return;
    void queryClient.invalidateQueries({ queryKey: conceptsQueryKey(matterId) });
    void state.refetch();
    // eslint-disable-next-line react-hooks/exhaustive-deps -- once per settled job
  }, [settled, matterId, queryClient]);

  function submit(event: FormEvent) {
    event.preventDefault();
    setTouched(true);
    if (k == null) return;
    rebuild.mutate({ k, weighting }, { onSuccess: (answer) => setJobId(answer.job.id) });
  }

  const serverKError = fieldErrorOf(rebuild.error, 'k');
  const preview = energyPreview(current, k);

  return (
    <form
      onSubmit={submit}
      noValidate
      aria-labelledby={`${formId}-title`}
      className="space-y-3 rounded-md border border-line bg-panel p-4"
      data-testid="rebuild-form"
    >
      <div>
        <h2 id={`${formId}-title`} className="text-sm font-semibold">
          Try another k
        </h2>
        <p className="mt-0.5 text-[13px] text-ink-muted">
          Rebuilds the concept space from every extracted document. Version {current.version} keeps
          serving searches until the new one is ready.
        </p>
      </div>
      <div className="flex flex-wrap items-start gap-3">
        <div className="w-32 space-y-1">
          <label htmlFor={`${formId}-k`} className="block text-[13px] font-medium">
            Concepts (k)
          </label>
          <input
            id={`${formId}-k`}
            type="number"
            inputMode="numeric"
            min={1}
            max={INDEX_K_MAX}
            step={1}
            value={rawK}
            onChange={(event) => setRawK(event.target.value)}
            onBlur={() => setTouched(true)}
            aria-invalid={(touched && kError) || serverKError ? true : undefined}
            aria-describedby={`${formId}-k-note`}
            className={inputClass}
            data-testid="rebuild-k"
          />
        </div>
        <Select
          label="Weighting"
          className="min-w-72 flex-1"
          options={INDEX_WEIGHTINGS.map((value) => ({ value, label: WEIGHTING_LABELS[value] }))}
          value={weighting}
          onChange={(event) => setWeighting(event.target.value as IndexWeighting)}
          data-testid="rebuild-weighting"
          error={fieldErrorOf(rebuild.error, 'weighting')}
        />
      </div>
      <p id={`${formId}-k-note`} className="text-[13px]" aria-live="polite">
        {(touched && kError) || serverKError ? (
          <span className="font-medium text-danger">{serverKError ?? kError}</span>
        ) : preview ? (
          <span className="text-ink" data-testid="rebuild-preview">
            {preview}
          </span>
        ) : (
          <span className="text-ink-muted">
            A smaller k keeps fewer, broader concepts; a k close to the number of documents
            approaches keyword matching.
          </span>
        )}
      </p>
      <div className="flex items-center gap-3">
        <Button
          type="submit"
          variant="primary"
          busy={rebuild.isPending}
          disabled={busy}
          data-testid="rebuild-submit"
        >
          Rebuild with k = {k ?? '…'}
        </Button>
        {busy && !rebuild.isPending ? (
          <span className="text-[13px] text-ink-muted">A build is running.</span>
        ) : null}
      </div>
      {rebuild.isError && !serverKError ? (
        <Notice tone="danger" title="The rebuild was not started">
          {describeError(rebuild.error)}
        </Notice>
      ) : null}
      {shownJob ? (
        <div className="border-t border-line pt-3" data-testid="rebuild-progress">
          <JobProgress job={shownJob} />
          {trackedJob?.status === 'succeeded' ? (
            <p className="mt-1 text-[13px] text-ok" role="status" data-testid="rebuild-done">
              The new version serves now; its figures are shown beside the previous one.
            </p>
          ) : null}
        </div>
      ) : null}
    </form>
  );
}

function runningBuildJob(state: IndexStateResponse | undefined) {
  const job = state?.activeJob;
  return job && job.kind === 'build-index' && isJobActive(job) ? job : null;
}
