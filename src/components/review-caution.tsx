import { cn } from '../lib/cn';

/**
 * The standing caution wherever search results feed legal decisions
 * (concept search pages, exports, review screens).
 */
export function ReviewCaution({
  className,
  compact = false,
}: {
  className?: string;
  compact?: boolean;
}) {
  return (
    <aside
      aria-label="Review caution"
      data-testid="review-caution"
      className={cn(
        'rounded-md border border-warn/30 bg-warn-soft/70 px-3 py-2 text-[13px] leading-snug text-ink',
        className,
      )}
    >
      <strong className="font-semibold text-warn">Review caution.</strong> Concept search assists
      attorney review; it does not decide relevance or privilege.
      {compact ? ' ' : <br />}
      Validate recall (for example by sampling the unreviewed set) before certifying a production.
      Follow the ESI protocol, court orders and local rules, and defer to licensed counsel.
    </aside>
  );
}
