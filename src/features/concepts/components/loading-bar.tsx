/**
 * A number with a horizontal bar proportional to it, so a column of values reads at a
 * glance and still carries the figure itself (never colour or length alone).
 */
export function ValueBar({
  value,
  max,
  label,
  digits = 3,
  tone = 'accent',
}: {
  value: number;
  /** The value a full bar stands for (e.g. the largest |value| of the list). */
  max: number;
  label: string;
  digits?: number;
  tone?: 'accent' | 'muted';
}) {
  const share = max > 0 ? Math.min(Math.abs(value) / max, 1) : 0;
  return (
    <div className="flex items-center gap-2">
      <span className="w-32 shrink-0 truncate text-[13px]" title={label}>
        {label}
      </span>
      <span aria-hidden="true" className="relative h-2 min-w-12 flex-1 rounded-sm bg-sunk">
        <span
          className={`absolute inset-y-0 left-0 rounded-sm ${tone === 'accent' ? 'bg-accent' : 'bg-ink-faint'}`}
          style={{ width: `${share * 100}%` }}
        />
      </span>
      <span className="w-14 shrink-0 text-right font-mono text-xs tabular-nums">
        {value.toFixed(digits)}
      </span>
    </div>
  );
}
