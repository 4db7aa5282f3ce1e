import { cn } from '@/lib/cn';

export function Spinner({
  size = 'md',
  label = 'Loading',
  className,
}: {
  size?: 'sm' | 'md';
  /** Read by screen readers; pass '' when the surrounding text already says it. */
  label?: string;
  className?: string;
}) {
  const dimension = size === 'sm' ? 'size-3.5 border-[2px]' : 'size-5 border-2';
  return (
    <span
      role={label ? 'status' : undefined}
      aria-label={label || undefined}
      aria-hidden={label ? undefined : true}
      className={cn(
        'inline-block animate-spin rounded-full border-current border-r-transparent align-[-2px] motion-reduce:animate-none',
        dimension,
        className,
      )}
    />
  );
}

/** A centred spinner with a line of text, for a whole page or panel. */
export function LoadingBlock({ label = 'Loading…' }: { label?: string }) {
  return (
    <div className="flex items-center gap-2 px-1 py-6 text-sm text-ink-muted" role="status">
      <Spinner size="sm" label="" />
      <span>{label}</span>
    </div>
  );
}

/** Grey bars standing in for rows that are still loading. */
export function SkeletonRows({ rows = 4, label = 'Loading' }: { rows?: number; label?: string }) {
  return (
    <div role="status" aria-label={label} className="space-y-2 py-2">
      {Array.from({ length: rows }, (_, index) => (
        <div
          key={index}
          className="h-7 animate-pulse rounded bg-sunk motion-reduce:animate-none"
          style={{ width: `${92 - ((index * 13) % 30)}%` }}
        />
      ))}
    </div>
  );
}
