import type { UseMutationResult } from '@tanstack/react-query';
import type { AppliedCode, DocumentCodesResponse } from '@shared/schemas/codes';
import { Notice, describeError } from '@/components/ui';
import { cn } from '@/lib/cn';
import { formatDateTime } from '@/lib/format';
import type { Code } from '@/features/codes/api/get-codes';
import type { SetDocumentCodesVars } from '@/features/codes/api/set-document-codes';
import { keyOfCode } from '../keyboard';
import { Kbd } from './key-legend';

/** Toggle buttons for the code set, each with its key; archived codes show but cannot be applied. */
export function CodingPanel({
  active,
  applied,
  keyMap,
  canCode,
  onToggle,
  mutation,
}: {
  active: Code[];
  applied: AppliedCode[];
  keyMap: Map<string, Code>;
  canCode: boolean;
  onToggle: (code: Code) => void;
  mutation: UseMutationResult<DocumentCodesResponse, Error, SetDocumentCodesVars, unknown>;
}) {
  const appliedIds = new Set(applied.map((code) => code.id));
  const archivedApplied = applied.filter((code) => !active.some((a) => a.id === code.id));
  return (
    <section
      className="rounded-md border border-line bg-panel p-3"
      aria-labelledby="codes-heading"
      data-testid="coding-panel"
    >
      <h2 id="codes-heading" className="mb-2 text-sm font-semibold">
        Codes
      </h2>
      <div className="flex flex-col gap-1.5" role="group" aria-label="Codes for this document">
        {active.map((code) => {
          const on = appliedIds.has(code.id);
          const key = keyOfCode(keyMap, code.id);
          const who = applied.find((a) => a.id === code.id);
          return (
            <button
              key={code.id}
              type="button"
              aria-pressed={on}
              disabled={!canCode}
              onClick={() => onToggle(code)}
              className={cn(
                'flex items-center gap-2 rounded-md border px-2.5 py-1.5 text-left text-[13px] transition-colors disabled:cursor-not-allowed',
                on
                  ? 'border-accent-strong bg-accent text-white'
                  : 'border-line-strong bg-panel text-ink hover:bg-sunk',
              )}
              title={
                who?.codedBy
                  ? `Applied by ${who.codedBy.name}, ${formatDateTime(who.codedAt)}`
                  : undefined
              }
              data-testid="code-toggle"
              data-code-name={code.name}
              data-applied={on ? 'true' : 'false'}
            >
              <span aria-hidden="true" className="w-4 text-center font-bold">
                {on ? '✓' : ''}
              </span>
              <span className="flex-1 font-medium">{code.name}</span>
              {code.marksPrivileged ? (
                <span className={cn('text-[11px]', on ? 'text-white/85' : 'text-ink-faint')}>
                  privilege log
                </span>
              ) : null}
              {key ? <Kbd>{key}</Kbd> : null}
            </button>
          );
        })}
      </div>
      {archivedApplied.length > 0 ? (
        <p className="mt-2 text-xs text-ink-muted">
          Archived codes on this document: {archivedApplied.map((c) => c.name).join(', ')}
        </p>
      ) : null}
      {canCode ? (
        <p className="mt-2 text-xs text-ink-muted">
          A code's key applies or removes it; <Kbd>j</Kbd> <Kbd>k</Kbd> move on and back;{' '}
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
