import { cn } from '@/lib/cn';

type Tone = 'accent' | 'ok' | 'danger';

const fills: Record<Tone, string> = {
  accent: 'bg-accent',
  ok: 'bg-ok',
  danger: 'bg-danger',
};

/**
 * A horizontal progress bar with the WAI-ARIA progressbar role (WAI-ARIA 1.2): the value
 * is announced as a percentage, or as "in progress" when the total is not known yet.
 */
export function ProgressBar({
  value,
  max = 1,
  label,
  valueText,
  tone = 'accent',
  className,
  testId,
}: {
  /** Done so far, out of `max`; null when the amount is unknown (an indeterminate bar). */
  value: number | null;
  max?: number;
  /** Names the bar for assistive technology. */
  label: string;
  /** How the value is read out, e.g. "3 of 12 files". */
  valueText?: string;
  tone?: Tone;
  className?: string;
  testId?: string;
}) {
  const fraction = value == null || max <= 0 ? null : Math.min(Math.max(value / max, 0), 1);
  const percent = fraction == null ? null : Math.round(fraction * 100);
  return (
    <div
      role="progressbar"
      aria-label={label}
      aria-valuemin={0}
      aria-valuemax={100}
      aria-valuenow={percent ?? undefined}
      aria-valuetext={valueText ?? (percent == null ? 'In progress' : `${percent}%`)}
      data-testid={testId}
      data-value={percent ?? undefined}
      className={cn('h-1.5 w-full overflow-hidden rounded-full bg-sunk', className)}
    >
      {fraction == null ? (
        <div
          className={cn(
            'h-full w-1/3 animate-pulse rounded-full motion-reduce:animate-none',
            fills[tone],
          )}
        />
      ) : (
        <div
          className={cn('h-full rounded-full transition-[width] duration-300', fills[tone])}
          style={{ width: `${fraction * 100}%` }}
        />
      )}
    </div>
  );
}
