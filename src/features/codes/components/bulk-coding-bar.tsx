import { useState } from 'react';
import { PRIVILEGE_TYPES } from '@shared/schemas/codes';
import { Button, Notice, Select, describeError, inputClass } from '@/components/ui';
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
  const [withFamilies, setWithFamilies] = useState(false);
  const [privilegeType, setPrivilegeType] = useState<string>(PRIVILEGE_TYPES[0]);
  const [basis, setBasis] = useState('');
  const chosen = codeId || (usable[0] ? String(usable[0].id) : '');
  const count = selectedIds.length;
  const marksPrivilege = usable.find((c) => String(c.id) === chosen)?.marksPrivileged ?? false;

  function apply(kind: 'add' | 'remove') {
    if (!chosen) return;
    bulk.mutate({
      documentIds: selectedIds,
      add: kind === 'add' ? [Number(chosen)] : [],
      remove: kind === 'remove' ? [Number(chosen)] : [],
      withFamilies,
      ...(kind === 'add' && marksPrivilege
        ? { privilege: { type: privilegeType, basis: basis.trim() } }
        : {}),
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
        {marksPrivilege ? (
          <>
            <select
              aria-label="Privilege type"
              className={`${inputClass} w-48`}
              value={privilegeType}
              onChange={(e) => setPrivilegeType(e.target.value)}
            >
              {PRIVILEGE_TYPES.map((t) => (
                <option key={t}>{t}</option>
              ))}
            </select>
            <input
              aria-label="Privilege basis"
              placeholder="Basis (required)"
              className={`${inputClass} w-56`}
              value={basis}
              onChange={(e) => setBasis(e.target.value)}
              maxLength={200}
            />
          </>
        ) : null}
        <label className="flex items-center gap-1.5">
          <input
            type="checkbox"
            checked={withFamilies}
            onChange={(e) => setWithFamilies(e.target.checked)}
            data-testid="bulk-with-families"
          />
          With families
        </label>
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
