import { Link } from 'react-router-dom';

/** Quarry's wordmark: a cut-stone glyph (three stacked blocks) and the name. */
export function Wordmark({ to = '/matters' }: { to?: string }) {
  return (
    <Link to={to} className="flex items-center gap-2 rounded text-ink" aria-label="Quarry home">
      <svg width="20" height="20" viewBox="0 0 20 20" aria-hidden="true">
        <rect x="2" y="12" width="16" height="6" rx="1" fill="var(--color-accent)" />
        <rect
          x="4"
          y="6.5"
          width="12"
          height="4.5"
          rx="1"
          fill="var(--color-accent)"
          opacity="0.7"
        />
        <rect
          x="6.5"
          y="2"
          width="7"
          height="3.5"
          rx="1"
          fill="var(--color-accent)"
          opacity="0.45"
        />
      </svg>
      <span className="text-[15px] font-semibold tracking-tight">Quarry</span>
    </Link>
  );
}
