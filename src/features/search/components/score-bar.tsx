/** A relevance bar with its number beside it (the bar alone would rely on length and colour). */
export function ScoreBar({ score, rawScore }: { score: number; rawScore: number }) {
  const clamped = Math.max(0, Math.min(1, score));
  const percent = Math.round(clamped * 100);
  return (
    <span
      className="flex items-center gap-2"
      title={`Score ${clamped.toFixed(3)} (raw ${rawScore.toFixed(3)})`}
    >
      <span
        className="relative h-2 w-16 shrink-0 overflow-hidden rounded-sm border border-line-strong bg-sunk"
        role="meter"
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={percent}
        aria-label="Score"
      >
        <span className="absolute inset-y-0 left-0 bg-accent" style={{ width: `${percent}%` }} />
      </span>
      <span className="w-9 text-right font-mono text-xs tabular-nums text-ink">
        {clamped.toFixed(2)}
      </span>
    </span>
  );
}
