import { type FormEvent, useEffect, useState } from 'react';
import {
  PRIVILEGE_BASIS_MAX_LENGTH,
  PRIVILEGE_DESCRIPTION_MAX_LENGTH,
  type PrivilegeEntry,
} from '@shared/schemas/review';
import { Button, Notice, TextField, describeError } from '@/components/ui';
import { formatDateTime } from '@/lib/format';
import { useSavePrivilege } from '../api/save-privilege';

/** Basis and description for the privilege log; shown once a privilege code is applied. */
export function PrivilegePanel({
  matterId,
  docId,
  entry,
  canEdit,
}: {
  matterId: number;
  docId: number;
  entry: PrivilegeEntry | null;
  canEdit: boolean;
}) {
  const [basis, setBasis] = useState(entry?.basis ?? '');
  const [description, setDescription] = useState(entry?.description ?? '');
  const save = useSavePrivilege(matterId, docId);
  useEffect(() => {
    setBasis(entry?.basis ?? '');
    setDescription(entry?.description ?? '');
  }, [entry, docId]);
  const changed = basis !== (entry?.basis ?? '') || description !== (entry?.description ?? '');

  function submit(event: FormEvent) {
    event.preventDefault();
    save.mutate({ basis: basis.trim(), description: description.trim() });
  }

  return (
    <section
      className="rounded-md border border-warn/40 bg-warn-soft/40 p-3"
      aria-labelledby="privilege-heading"
      data-testid="privilege-panel"
    >
      <h2 id="privilege-heading" className="mb-1 text-sm font-semibold">
        Privilege log entry
      </h2>
      <p className="mb-2 text-xs text-ink-muted">
        What the log will say about this document. Describe it without revealing the privileged
        content.
      </p>
      <form onSubmit={submit} className="space-y-2">
        <TextField
          label="Basis"
          placeholder="e.g. Legal advice privilege"
          value={basis}
          maxLength={PRIVILEGE_BASIS_MAX_LENGTH}
          disabled={!canEdit}
          onChange={(event) => setBasis(event.target.value)}
          data-testid="privilege-basis"
        />
        <div className="space-y-1">
          <label
            htmlFor={`privilege-description-${docId}`}
            className="block text-[13px] font-medium text-ink"
          >
            Description
          </label>
          <textarea
            id={`privilege-description-${docId}`}
            rows={3}
            value={description}
            maxLength={PRIVILEGE_DESCRIPTION_MAX_LENGTH}
            disabled={!canEdit}
            onChange={(event) => setDescription(event.target.value)}
            className="block w-full rounded-md border border-line-strong bg-panel px-2.5 py-1.5 text-sm"
            data-testid="privilege-description"
          />
        </div>
        {save.isError ? (
          <Notice tone="danger" title="Not saved">
            {describeError(save.error)}
          </Notice>
        ) : null}
        <div className="flex items-center justify-between gap-2">
          <span className="text-[11px] text-ink-faint">
            {entry?.updatedAt
              ? `Saved ${formatDateTime(entry.updatedAt)}${entry.updatedBy ? ` by ${entry.updatedBy.name}` : ''}`
              : 'Not filled in yet'}
          </span>
          {canEdit ? (
            <Button
              type="submit"
              size="sm"
              busy={save.isPending}
              disabled={!changed}
              data-testid="privilege-save"
            >
              Save entry
            </Button>
          ) : null}
        </div>
      </form>
    </section>
  );
}
