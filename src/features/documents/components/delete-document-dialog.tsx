import { useId, useState } from 'react';
import { Button, Dialog, Notice, describeError } from '@/components/ui';
import { inputBase } from '@/components/ui/text-field';
import { fieldErrorOf, isApiError } from '@/lib/api-client';
import { useDeleteDocument } from '../api/delete-document';

/**
 * Confirms deleting a document. The reason is asked every time and required by the server
 * when the document (or an attachment) is coded: such a document goes to the trash, from
 * which a matter lead can restore it. A legal hold refuses the deletion (the hold is named).
 */
export function DeleteDocumentDialog({
  matterId,
  document,
  onClose,
  onDeleted,
}: {
  matterId: number;
  document: { id: number; controlNumber: string; name: string; error?: string | null } | null;
  onClose: () => void;
  onDeleted?: (outcome: 'trashed' | 'deleted') => void;
}) {
  const remove = useDeleteDocument(matterId);
  const [reason, setReason] = useState('');
  const reasonId = useId();
  const reasonError = fieldErrorOf(remove.error, 'reason');
  const held = isApiError(remove.error) && remove.error.status === 409;
  const close = () => {
    setReason('');
    remove.reset();
    onClose();
  };
  return (
    <Dialog
      open={document != null}
      onClose={close}
      title={document ? `Delete ${document.controlNumber}?` : 'Delete document'}
      description="An uncoded document is deleted for good: its original, text and index entries. A coded one goes to the trash first. The activity log keeps a record either way."
    >
      {document ? (
        <div className="space-y-3" data-testid="delete-document-dialog">
          <p className="text-sm">
            <span className="font-medium">{document.name}</span>
            {document.error ? (
              <span className="text-ink-muted"> — failed: {document.error}</span>
            ) : null}
          </p>
          <div className="space-y-1">
            <label htmlFor={reasonId} className="block text-[13px] font-medium text-ink">
              Reason (required when the document is coded)
            </label>
            <textarea
              id={reasonId}
              rows={3}
              value={reason}
              onChange={(event) => setReason(event.target.value)}
              aria-invalid={reasonError ? true : undefined}
              className={`${inputBase} px-2.5 py-1.5 text-sm`}
              data-testid="delete-reason"
            />
            {reasonError ? (
              <p className="text-xs font-medium text-danger" data-testid="delete-reason-error">
                {reasonError}
              </p>
            ) : null}
          </div>
          {remove.isError && !reasonError ? (
            <div data-testid="delete-refused">
              <Notice
                tone="danger"
                title={held ? 'Under legal hold' : 'The document was not deleted'}
              >
                {describeError(remove.error)}
              </Notice>
            </div>
          ) : null}
          <div className="flex justify-end gap-2">
            <Button onClick={close}>Keep it</Button>
            <Button
              variant="danger"
              busy={remove.isPending}
              data-testid="confirm-remove"
              onClick={() =>
                // mutateAsync, not mutate's callbacks: the refetch after the deletion can
                // unmount the page that holds this dialog (its document is gone), and
                // TanStack Query drops mutate's callbacks for an unmounted component.
                remove.mutateAsync({ docId: document.id, reason: reason.trim() || undefined }).then(
                  (result) => {
                    setReason('');
                    onDeleted?.(result.outcome);
                    onClose();
                  },
                  () => undefined, // shown from remove.error
                )
              }
            >
              Delete document
            </Button>
          </div>
        </div>
      ) : null}
    </Dialog>
  );
}
