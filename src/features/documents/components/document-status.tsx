import { Link } from 'react-router-dom';
import type { DocumentStatus, IndexState } from '@shared/schemas/documents';
import { Badge, Spinner } from '@/components/ui';
import { INDEX_STATE_LABELS, STATUS_LABELS } from '../format';

const STATUS_TONES = {
  pending: 'neutral',
  extracting: 'info',
  extracted: 'ok',
  failed: 'danger',
  duplicate: 'warn',
} as const;

/**
 * A document's status in words: extracted, failed with its reason, or a duplicate with
 * a link to the first copy.
 */
export function DocumentStatusCell({
  matterId,
  status,
  error,
  duplicateOf,
  duplicateOfControlNumber,
}: {
  matterId: number;
  status: DocumentStatus;
  error?: string | null;
  duplicateOf?: number | null;
  duplicateOfControlNumber?: string | null;
}) {
  return (
    <span className="inline-flex min-w-0 flex-wrap items-center gap-x-1.5 gap-y-0.5">
      <Badge tone={STATUS_TONES[status]}>
        {status === 'pending' || status === 'extracting' ? (
          <Spinner size="sm" label="" className="mr-1 size-2.5 border-[1.5px]" />
        ) : null}
        {STATUS_LABELS[status]}
      </Badge>
      {status === 'failed' && error ? (
        <span className="text-xs text-danger" data-testid="failure-reason">
          {error}
        </span>
      ) : null}
      {status === 'duplicate' && duplicateOf ? (
        <span className="text-xs text-ink-muted">
          of{' '}
          <Link
            to={`/matters/${matterId}/documents/${duplicateOf}`}
            className="font-mono text-accent-strong underline-offset-2 hover:underline"
            onClick={(event) => event.stopPropagation()}
          >
            {duplicateOfControlNumber ?? `#${duplicateOf}`}
          </Link>
        </span>
      ) : null}
    </span>
  );
}

const INDEX_TONES = {
  indexed: 'ok',
  folded: 'accent',
  waiting: 'neutral',
  failed: 'neutral',
  duplicate: 'neutral',
} as const;

export function IndexStateBadge({ state }: { state: IndexState }) {
  return <Badge tone={INDEX_TONES[state]}>{INDEX_STATE_LABELS[state]}</Badge>;
}
