import { useState } from 'react';
import { Button, Notice, Select, describeError } from '@/components/ui';
import { useBulkCodeDocuments } from '../api/bulk-code-documents';
import { type Code, activeCodes } from '../api/get-codes';

/** Applies or removes one code on every selected row (one audit row per document changed). */
export function BulkCodingBar({
  matterId,
  codes,
  selectedIds,
  onClear,
}: {
  matterId: number;
  codes: Code[];
  selectedIds: number[];
  onClear: () => void;
}) {
  const usable = activeCodes(codes);
  const [codeId, setCodeId] = useState<string>('');
  const bulk = useBulkCodeDocuments(matterId);
  const chosen = codeId || (usable[0] ? String(usable[0].id) : '');
  const count = selectedIds.length;

  function apply(kind: 'add' | 'remove') {
    if (!chosen) return;
    bulk.mutate({
      documentIds: selectedIds,
      add: kind === 'add' ? [Number(chosen)] : [],
      remove: kind === 'remove' ? [Number(chosen)] : [],
    });
  }

  return (
    <div
      className="sticky top-0 z-10 mb-2 space-y-2 rounded-md border border-accent/40 bg-accent-soft px-3 py-2"
      data-testid="bulk-coding"
      aria-label="Code the selected documents"
      role="region"
    >
      <div className="flex flex-wrap items-center gap-2 text-[13px]">
        <span className="font-semibold text-accent-strong" aria-live="polite">
          {count} selected
        </span>
        <Select
          compact
          aria-label="Code to apply or remove"
          className="w-48"
          options={usable.map((code) => ({ value: String(code.id), label: code.name }))}
          value={chosen}
          onChange={(event) => setCodeId(event.target.value)}
          data-testid="bulk-code"
        />
        <Button
          size="sm"
          variant="primary"
          busy={bulk.isPending && (bulk.variables.add?.length ?? 0) > 0}
          onClick={() => apply('add')}
          data-testid="bulk-apply"
        >
          Apply to {count}
        </Button>
        <Button
          size="sm"
          busy={bulk.isPending && (bulk.variables.remove?.length ?? 0) > 0}
          onClick={() => apply('remove')}
          data-testid="bulk-remove"
        >
          Remove from {count}
        </Button>
        <Button size="sm" variant="quiet" onClick={onClear}>
          Clear selection
        </Button>
        {bulk.isSuccess ? (
          <span className="text-ink-muted" role="status">
            {bulk.data.changed} changed, {bulk.data.unchanged} already so.
          </span>
        ) : null}
      </div>
      {bulk.isError ? (
        <Notice tone="danger" title="The codes were not changed">
          {describeError(bulk.error)}
        </Notice>
      ) : null}
    </div>
  );
}
