import { type FormEvent, useEffect, useRef, useState } from 'react';
import type { UseMutationResult } from '@tanstack/react-query';
import {
  CODE_COLOURS,
  PRIVILEGE_TYPES,
  type AppliedCode,
  type CodeGroup,
  type DocumentCodesResponse,
  type PrivilegeFieldsReq,
} from '@shared/schemas/codes';
import { Button, Notice, describeError, inputClass } from '@/components/ui';
import { cn } from '@/lib/cn';
import { formatDateTime } from '@/lib/format';
import type { Code } from '@/features/codes/api/get-codes';
import type { SetDocumentCodesVars } from '@/features/codes/api/set-document-codes';
import { keyOfCode } from '../keyboard';
import { Kbd } from './key-legend';

const GROUP_HINT: Record<CodeGroup['kind'], string> = {
  single: 'one choice',
  multi: 'any number',
  privilege: 'one choice · privilege log',
};

/** The code set by group, each code with its colour and key; archived codes show but cannot be applied. */
export function CodingPanel({
  active,
  groups,
  applied,
  keyMap,
  canCode,
  locked,
  missing,
  onChoose,
  mutation,
  pendingPrivilege,
  onPrivilege,
  onCancelPrivilege,
}: {
  active: Code[];
  groups: CodeGroup[];
  applied: AppliedCode[];
  keyMap: Map<string, Code>;
  canCode: boolean;
  locked: boolean;
  /** Required groups still empty. */
  missing: CodeGroup[];
  onChoose: (code: Code) => void;
  mutation: UseMutationResult<DocumentCodesResponse, Error, SetDocumentCodesVars, unknown>;
  /** A privilege code waiting for its type and basis. */
  pendingPrivilege: Code | null;
  onPrivilege: (fields: PrivilegeFieldsReq) => void;
  onCancelPrivilege: () => void;
}) {
  const appliedIds = new Set(applied.map((code) => code.id));
  const archivedApplied = applied.filter((code) => !active.some((a) => a.id === code.id));
  const ungrouped = active.filter((c) => !groups.some((g) => g.id === c.groupId));
  const sections = [
    ...groups.map((g) => ({
      group: g as CodeGroup | null,
      codes: active.filter((c) => c.groupId === g.id),
    })),
    ...(ungrouped.length ? [{ group: null, codes: ungrouped }] : []),
  ].filter((s) => s.codes.length > 0);
  return (
    <section
      className="rounded-md border border-line bg-panel p-3"
      aria-labelledby="codes-heading"
      data-testid="coding-panel"
    >
      <h2 id="codes-heading" className="mb-2 text-sm font-semibold">
        Codes
      </h2>
      {locked ? (
        <Notice tone="info" className="mb-2" title="Checked by quality control">
          This document's coding is locked; the matter lead can unlock it.
        </Notice>
      ) : null}
      <div className="space-y-3">
        {sections.map(({ group, codes }) => (
          <fieldset
            key={group?.id ?? 'other'}
            data-testid="code-group"
            data-group-name={group?.name ?? 'Other'}
          >
            <legend className="mb-1 flex w-full items-baseline justify-between text-xs font-semibold text-ink-muted">
              <span>
                {group?.name ?? 'Other codes'}
                {group?.required ? <span className="ml-1 text-danger">required</span> : null}
              </span>
              {group ? <span className="font-normal">{GROUP_HINT[group.kind]}</span> : null}
            </legend>
            <div
              className="flex flex-col gap-1"
              role="group"
              aria-label={group?.name ?? 'Other codes'}
            >
              {codes.map((code) => {
                const on = appliedIds.has(code.id);
                const key = keyOfCode(keyMap, code.id);
                const who = applied.find((a) => a.id === code.id);
                const colour = CODE_COLOURS[code.colour] ?? CODE_COLOURS.slate;
                return (
                  <button
                    key={code.id}
                    type="button"
                    aria-pressed={on}
                    disabled={!canCode || locked}
                    onClick={() => onChoose(code)}
                    className={cn(
                      'flex items-center gap-2 rounded-md border px-2.5 py-1.5 text-left text-[13px] transition-colors disabled:cursor-not-allowed',
                      on
                        ? 'border-transparent font-semibold'
                        : 'border-line-strong bg-panel text-ink hover:bg-sunk',
                    )}
                    style={
                      on
                        ? { backgroundColor: colour.bg, color: colour.fg, borderColor: colour.fg }
                        : undefined
                    }
                    title={
                      who?.codedBy
                        ? `Applied by ${who.codedBy.name}, ${formatDateTime(who.codedAt)}`
                        : undefined
                    }
                    data-testid="code-toggle"
                    data-code-name={code.name}
                    data-applied={on ? 'true' : 'false'}
                  >
                    <span
                      aria-hidden="true"
                      className="h-3 w-3 shrink-0 rounded-full border"
                      style={{ backgroundColor: colour.bg, borderColor: colour.fg }}
                    />
                    <span className="flex-1">{code.name}</span>
                    <span className="sr-only">{on ? '(applied)' : ''}</span>
                    {key ? <Kbd>{key}</Kbd> : null}
                  </button>
                );
              })}
            </div>
          </fieldset>
        ))}
      </div>
      {pendingPrivilege ? (
        <PrivilegeFieldsForm
          code={pendingPrivilege}
          onSubmit={onPrivilege}
          onCancel={onCancelPrivilege}
          busy={mutation.isPending}
        />
      ) : null}
      {missing.length > 0 && canCode ? (
        <p className="mt-2 text-xs text-danger" data-testid="missing-required">
          Required before moving on: {missing.map((g) => g.name).join(', ')}
        </p>
      ) : null}
      {archivedApplied.length > 0 ? (
        <p className="mt-2 text-xs text-ink-muted">
          Archived codes on this document: {archivedApplied.map((c) => c.name).join(', ')}
        </p>
      ) : null}
      {canCode ? (
        <p className="mt-2 text-xs text-ink-muted">
          A code's key chooses or removes it; <Kbd>j</Kbd> <Kbd>k</Kbd> move on and back;{' '}
          <Kbd>?</Kbd> shows every key.
        </p>
      ) : (
        <p className="mt-2 text-xs text-ink-muted">Your role may not code documents.</p>
      )}
      {mutation.isError ? (
        <Notice tone="danger" className="mt-2" title="The change was not saved">
          {describeError(mutation.error)} The codes shown are the ones stored.
        </Notice>
      ) : null}
    </section>
  );
}

const OTHER = '__other__';

/** Privilege type and basis, asked for when a privilege code is chosen without them. */
function PrivilegeFieldsForm({
  code,
  onSubmit,
  onCancel,
  busy,
}: {
  code: Code;
  onSubmit: (fields: PrivilegeFieldsReq) => void;
  onCancel: () => void;
  busy: boolean;
}) {
  const [type, setType] = useState<string>(PRIVILEGE_TYPES[0]);
  const [own, setOwn] = useState('');
  const [basis, setBasis] = useState('');
  const [error, setError] = useState<string | null>(null);
  const first = useRef<HTMLSelectElement>(null);
  useEffect(() => first.current?.focus(), []);
  function submit(event: FormEvent) {
    event.preventDefault();
    const chosen = type === OTHER ? own.trim() : type;
    if (!chosen) return setError('Privilege type is required.');
    if (!basis.trim()) return setError('Basis is required.');
    onSubmit({ type: chosen, basis: basis.trim() });
  }
  return (
    <form
      onSubmit={submit}
      onKeyDown={(e) => {
        if (e.key === 'Escape') onCancel();
      }}
      className="mt-3 space-y-2 rounded-md border border-line-strong bg-sunk p-2.5 text-[13px]"
      data-testid="privilege-fields"
    >
      <p className="font-semibold">{code.name} needs a privilege type and a basis</p>
      <label className="block">
        <span className="text-xs text-ink-muted">Privilege type</span>
        <select
          ref={first}
          value={type}
          onChange={(e) => setType(e.target.value)}
          className={inputClass}
          data-testid="privilege-type"
        >
          {PRIVILEGE_TYPES.map((t) => (
            <option key={t}>{t}</option>
          ))}
          <option value={OTHER}>Another type…</option>
        </select>
      </label>
      {type === OTHER ? (
        <input
          value={own}
          onChange={(e) => setOwn(e.target.value)}
          className={inputClass}
          aria-label="Privilege type (your own)"
          maxLength={80}
        />
      ) : null}
      <label className="block">
        <span className="text-xs text-ink-muted">Basis</span>
        <input
          value={basis}
          onChange={(e) => setBasis(e.target.value)}
          className={inputClass}
          maxLength={200}
          placeholder="e.g. Legal advice from outside counsel"
          data-testid="privilege-basis"
        />
      </label>
      {error ? (
        <p className="text-xs text-danger" role="alert">
          {error}
        </p>
      ) : null}
      <div className="flex gap-2">
        <Button
          type="submit"
          size="sm"
          variant="primary"
          disabled={busy}
          data-testid="privilege-apply"
        >
          Apply {code.name}
        </Button>
        <Button type="button" size="sm" variant="secondary" onClick={onCancel}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
