import type { Code } from '@/features/codes/api/get-codes';
import { NAVIGATION_KEYS } from '../keyboard';

export function Kbd({ children }: { children: string }) {
  return (
    <kbd className="inline-flex min-w-5 items-center justify-center rounded border border-line-strong border-b-2 bg-panel px-1 font-mono text-[11px] leading-4 text-ink">
      {children}
    </kbd>
  );
}

/** The viewer's keyboard map; keys do nothing while the cursor is in a field. */
export function KeyLegend({
  keyMap,
  hasPosition,
}: {
  keyMap: Map<string, Code>;
  hasPosition: boolean;
}) {
  return (
    <section
      className="rounded-md border border-line bg-panel p-3 text-[13px]"
      aria-labelledby="keys-heading"
      data-testid="key-legend"
    >
      <h2 id="keys-heading" className="mb-1.5 text-sm font-semibold">
        Keys
      </h2>
      <dl className="grid grid-cols-[4.5rem_minmax(0,1fr)] gap-x-2 gap-y-1">
        {NAVIGATION_KEYS.filter(
          (entry) => hasPosition || !['Next document', 'Previous document'].includes(entry.action),
        ).map((entry) => (
          <div key={entry.action} className="contents">
            <dt className="flex gap-1">
              {entry.keys.map((key) => (
                <Kbd key={key}>{key}</Kbd>
              ))}
            </dt>
            <dd className="text-ink-muted">{entry.action}</dd>
          </div>
        ))}
        {[...keyMap].map(([key, code]) => (
          <div key={key} className="contents">
            <dt>
              <Kbd>{key}</Kbd>
            </dt>
            <dd className="text-ink-muted">Apply or remove {code.name}</dd>
          </div>
        ))}
      </dl>
      <p className="mt-2 text-xs text-ink-faint">Keys are ignored while you type in a field.</p>
    </section>
  );
}
