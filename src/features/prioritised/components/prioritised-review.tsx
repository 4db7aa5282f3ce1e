import { Link } from 'react-router-dom';
import { MIN_CODES_EACH, MIN_CODES_FOR_TUNING, RETRAIN_EVERY } from '@shared/schemas/prioritised';
import type { PrioritisedStatusResponse } from '@shared/schemas/prioritised';
import { ReviewCaution } from '@/components/review-caution';
import {
  Badge,
  Button,
  EmptyState,
  ErrorPanel,
  Notice,
  QueryBoundary,
  Spinner,
  TBody,
  THead,
  Table,
  Td,
  Th,
  Tr,
} from '@/components/ui';
import { useMatterPermission } from '@/lib/authorization';
import { formatDateTime } from '@/lib/format';
import { useCreatePrioritisedBatch } from '../api/create-prioritised-batch';
import { usePrioritisedRanking } from '../api/get-prioritised-ranking';
import { usePrioritisedStatus } from '../api/get-prioritised-status';
import { useMoreLikeResponsive } from '../api/more-like-responsive';
import { useTrainRanking } from '../api/train-ranking';

const documentHref = (matterId: number, documentId: number) =>
  `/matters/${matterId}/documents/${documentId}`;

function NeededNotice({ status }: { status: PrioritisedStatusResponse }) {
  if (!status.codesPresent)
    return (
      <Notice tone="warn" title="Relevance codes missing" data-testid="prioritised-needed">
        Prioritised review learns from codes named “Responsive” and “Not responsive”. Add them to
        the code set to start.
      </Notice>
    );
  const parts: string[] = [];
  if (status.moreResponsiveNeeded > 0)
    parts.push(`${status.moreResponsiveNeeded} more coded Responsive`);
  if (status.moreNotResponsiveNeeded > 0)
    parts.push(`${status.moreNotResponsiveNeeded} more coded Not responsive`);
  return (
    <Notice tone="info" title="Not enough codes yet" data-testid="prioritised-needed">
      The learned ranking starts once {MIN_CODES_EACH} documents of each kind are coded: it needs{' '}
      {parts.join(' and ')}.
    </Notice>
  );
}

export function PrioritisedReview({ matterId }: { matterId: number }) {
  const status = usePrioritisedStatus(matterId);
  const canTrain = useMatterPermission('ranking.train');
  const train = useTrainRanking(matterId);
  const feedback = useMoreLikeResponsive(matterId);
  const batch = useCreatePrioritisedBatch(matterId);
  const ranking = usePrioritisedRanking(matterId, status.data?.model?.version ?? null);
  return (
    <div className="space-y-4" data-testid="prioritised-page">
      <ReviewCaution compact />
      <QueryBoundary query={status} errorTitle="The learned ranking could not be loaded">
        {(s) => (
          <section aria-label="Learned ranking" className="space-y-3">
            <p className="text-sm">
              Coded <strong data-testid="count-responsive">{s.responsive}</strong> Responsive and{' '}
              <strong data-testid="count-not-responsive">{s.notResponsive}</strong> Not responsive.
            </p>
            {s.moreResponsiveNeeded > 0 || s.moreNotResponsiveNeeded > 0 || !s.codesPresent ? (
              <NeededNotice status={s} />
            ) : null}
            {s.model ? (
              <p className="text-sm text-ink-muted" data-testid="prioritised-model">
                Model {s.model.version}, trained {formatDateTime(s.model.trainedAt)} on{' '}
                {s.model.positives} Responsive and {s.model.negatives} Not responsive codes (index
                version {s.model.indexVersion}); {s.model.scored.toLocaleString('en')} documents
                ranked. Trained in {Math.round(s.model.trainMs)} ms, ranked in{' '}
                {Math.round(s.model.rankMs)} ms. {s.newCodesSinceModel} new code
                {s.newCodesSinceModel === 1 ? '' : 's'} since; it retrains after every{' '}
                {RETRAIN_EVERY}.
              </p>
            ) : null}
            {s.model?.tuning ? (
              <Notice
                tone="info"
                title="Tuning the concept space from the codes"
                data-testid="prioritised-tuning"
              >
                Measured on the team’s codes by {s.model.tuning.folds}-fold cross-validation (mean
                average precision of held-out Responsive documents): the space as served (
                {s.model.tuning.current.dims} concept axes, keyword weight{' '}
                {s.model.tuning.current.keywordWeight}) scores{' '}
                {s.model.tuning.current.map.toFixed(3)}; {s.model.tuning.best.dims} axes with
                keyword weight {s.model.tuning.best.keywordWeight} scores{' '}
                {s.model.tuning.best.map.toFixed(3)} (
                {s.model.tuning.best.map - s.model.tuning.current.map >= 0 ? '+' : ''}
                {(s.model.tuning.best.map - s.model.tuning.current.map).toFixed(3)}). A
                recommendation for the next rebuild, not applied automatically.
              </Notice>
            ) : s.model ? (
              <p className="text-[13px] text-ink-muted">
                With {MIN_CODES_FOR_TUNING} codes of each kind, Quarry also measures which number of
                concept axes and which hybrid weight would rank best, as a recommendation for the
                next rebuild.
              </p>
            ) : null}
            <div className="flex flex-wrap items-center gap-2">
              {canTrain ? (
                <Button
                  onClick={() => train.mutate()}
                  disabled={train.isPending || s.training !== null}
                  data-testid="prioritised-train"
                >
                  Retrain now
                </Button>
              ) : null}
              {s.training ? (
                <span className="inline-flex items-center gap-2 text-sm text-ink-muted">
                  <Spinner size="sm" label="Training" /> Training in the background (
                  {s.training.status})
                </span>
              ) : null}
              <Button
                onClick={() => feedback.mutate({ limit: 50 })}
                disabled={feedback.isPending || s.responsive === 0}
                data-testid="more-like-responsive"
              >
                More like the documents coded Responsive
              </Button>
              {canTrain && s.model ? (
                <Button
                  onClick={() => batch.mutate({ size: 100, randomShare: 0.1 })}
                  disabled={batch.isPending}
                  data-testid="prioritised-batch"
                >
                  Next 100 most likely responsive
                </Button>
              ) : null}
              {s.model ? (
                <Link
                  className="text-sm text-accent-strong underline"
                  to={`/matters/${matterId}/search?mode=prioritised`}
                >
                  Open in search with filters
                </Link>
              ) : null}
            </div>
            {train.isError ? (
              <ErrorPanel error={train.error} title="Could not queue training" />
            ) : null}
          </section>
        )}
      </QueryBoundary>
      {batch.isError ? <ErrorPanel error={batch.error} title="Could not select a batch" /> : null}
      {batch.data ? (
        <Notice tone="info" title="Prioritised selection" data-testid="prioritised-batch-result">
          {batch.data.documents.length} documents from model {batch.data.modelVersion} (
          {batch.data.documents.filter((d) => d.random).length} drawn at random, seed{' '}
          {batch.data.seed}).{' '}
          {batch.data.batchId === null
            ? 'Review batches are not available on this server yet, so no batch was created; the selection is recorded in the activity log.'
            : `Batch ${batch.data.batchId} created.`}
        </Notice>
      ) : null}
      {feedback.isError ? (
        <ErrorPanel error={feedback.error} title="Could not search for similar documents" />
      ) : null}
      {feedback.data ? (
        <section aria-label="More like the Responsive documents" data-testid="feedback-results">
          <h2 className="mb-2 text-sm font-semibold">
            More like the {feedback.data.relevant} documents coded Responsive (Rocchio feedback,
            away from the {feedback.data.nonRelevant} coded Not responsive)
          </h2>
          <RankedTable
            matterId={matterId}
            rows={feedback.data.documents.map((d) => ({
              documentId: d.documentId,
              controlNumber: d.controlNumber,
              title: d.title,
              score: d.score,
              scoreLabel: `cosine ${d.score.toFixed(3)}`,
            }))}
          />
        </section>
      ) : null}
      {status.data?.model ? (
        <section aria-label="Most likely responsive" data-testid="prioritised-ranking">
          <h2 className="mb-2 text-sm font-semibold">Uncoded documents most likely responsive</h2>
          <QueryBoundary query={ranking} errorTitle="The ranking could not be loaded">
            {(r) =>
              r.hits.length === 0 ? (
                <EmptyState title="Every ranked document is coded" />
              ) : (
                <RankedTable
                  matterId={matterId}
                  rows={r.hits.map((h) => ({
                    documentId: h.documentId,
                    controlNumber: h.controlNumber,
                    title: h.title,
                    score: h.score,
                    scoreLabel: `${Math.round(h.score * 100)}% likely`,
                  }))}
                />
              )
            }
          </QueryBoundary>
        </section>
      ) : null}
    </div>
  );
}

function RankedTable({
  matterId,
  rows,
}: {
  matterId: number;
  rows: {
    documentId: number;
    controlNumber: string;
    title: string;
    score: number;
    scoreLabel: string;
  }[];
}) {
  return (
    <Table caption="Documents, best first">
      <THead>
        <tr>
          <Th className="w-12">#</Th>
          <Th className="w-40">Control number</Th>
          <Th>Title</Th>
          <Th className="w-40">Score</Th>
        </tr>
      </THead>
      <TBody>
        {rows.map((row, i) => (
          <Tr key={row.documentId} data-testid="ranked-row">
            <Td className="tabular-nums text-ink-muted">{i + 1}</Td>
            <Td className="font-mono text-[13px]">
              <Link
                className="text-accent-strong underline"
                to={documentHref(matterId, row.documentId)}
              >
                {row.controlNumber}
              </Link>
            </Td>
            <Td>{row.title}</Td>
            <Td>
              <Badge>{row.scoreLabel}</Badge>
            </Td>
          </Tr>
        ))}
      </TBody>
    </Table>
  );
}
