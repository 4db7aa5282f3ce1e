import { useState } from 'react';
import {
  Button,
  Dialog,
  EmptyState,
  ErrorPanel,
  Notice,
  SkeletonRows,
  describeError,
} from '@/components/ui';
import { Can } from '@/lib/authorization';
import { formatDateTime } from '@/lib/format';
import { useTrash, type TrashItem } from '../api/get-trash';
import { usePurgeTrashItem } from '../api/purge-trash-item';
import { useRestoreTrashItem } from '../api/restore-trash-item';

const codesOf = (item: TrashItem) => [...new Set(item.codes.map((c) => c.code))].join(', ');

/**
 * Deleted coded documents. Restore brings one back (with its attachments, codes and
 * notes); purge destroys it for good, which a legal hold refuses.
 */
export function TrashList({ matterId }: { matterId: number }) {
  const trash = useTrash(matterId);
  const restore = useRestoreTrashItem(matterId);
  const [purging, setPurging] = useState<TrashItem | null>(null);
  if (trash.isPending) return <SkeletonRows rows={4} label="Loading the trash" />;
  if (trash.isError)
    return (
      <ErrorPanel
        error={trash.error}
        title="The trash could not be loaded"
        onRetry={() => void trash.refetch()}
      />
    );
  if (trash.data.items.length === 0)
    return (
      <EmptyState title="The trash is empty">
        Coded documents that are deleted wait here until a matter lead restores or purges them.
      </EmptyState>
    );
  return (
    <div className="space-y-3">
      {restore.isError ? (
        <Notice tone="danger" title="The document was not restored">
          {describeError(restore.error)}
        </Notice>
      ) : null}
      <ul
        className="divide-y divide-line rounded-md border border-line bg-panel"
        data-testid="trash-list"
      >
        {trash.data.items.map((item) => (
          <li
            key={item.id}
            className="flex flex-wrap items-start justify-between gap-3 px-3 py-2.5 text-[13px]"
            data-testid="trash-item"
            data-control-number={item.controlNumber}
          >
            <div className="min-w-0 space-y-0.5">
              <p>
                <span className="font-mono">{item.controlNumber}</span>{' '}
                <span className="font-medium">{item.title}</span>
                {item.documentCount > 1 ? (
                  <span className="text-ink-muted">
                    {' '}
                    (with {item.documentCount - 1} attachment(s))
                  </span>
                ) : null}
              </p>
              <p className="text-ink-muted">
                Codes: {codesOf(item)} · deleted {formatDateTime(item.trashedAt)}
                {item.trashedBy ? ` by ${item.trashedBy}` : ''}
              </p>
              <p>Reason: {item.reason}</p>
            </div>
            <div className="flex shrink-0 gap-1.5">
              <Can permission="documents.restore">
                <Button
                  size="sm"
                  busy={restore.isPending && restore.variables === item.id}
                  onClick={() => restore.mutate(item.id)}
                  data-testid="restore-trash-item"
                >
                  Restore
                </Button>
              </Can>
              <Can permission="documents.purge">
                <Button
                  size="sm"
                  variant="danger"
                  onClick={() => setPurging(item)}
                  data-testid="purge-trash-item"
                >
                  Purge…
                </Button>
              </Can>
            </div>
          </li>
        ))}
      </ul>
      <PurgeDialog matterId={matterId} item={purging} onClose={() => setPurging(null)} />
    </div>
  );
}

function PurgeDialog({
  matterId,
  item,
  onClose,
}: {
  matterId: number;
  item: TrashItem | null;
  onClose: () => void;
}) {
  const purge = usePurgeTrashItem(matterId);
  const close = () => {
    purge.reset();
    onClose();
  };
  return (
    <Dialog
      open={item != null}
      onClose={close}
      title={item ? `Purge ${item.controlNumber}?` : 'Purge'}
      description="Purging cannot be undone: the document's text, index entries and original file are destroyed (an original another document also holds is kept). The activity log keeps the record, with its codes."
    >
      {item ? (
        <div className="space-y-3">
          {purge.isError ? (
            <Notice tone="danger" title="The document was not purged">
              {describeError(purge.error)}
            </Notice>
          ) : null}
          <div className="flex justify-end gap-2">
            <Button onClick={close}>Keep it in the trash</Button>
            <Button
              variant="danger"
              busy={purge.isPending}
              data-testid="confirm-purge"
              onClick={() => purge.mutate(item.id, { onSuccess: () => onClose() })}
            >
              Purge for good
            </Button>
          </div>
        </div>
      ) : null}
    </Dialog>
  );
}
