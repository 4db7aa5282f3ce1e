import type { ReactNode } from 'react';
import type { SnippetSegment } from '@shared/schemas/search';
import { cn } from '@/lib/cn';

// Two highlight styles that differ in shape as well as colour (WCAG 2.2, 1.4.1 Use of
// Color): your own words are bold on a solid tint; concept-related words carry a dotted
// underline and no fill.
export const MARK_CLASS = {
  query: 'rounded-[2px] bg-[#f3dcb2] px-px font-semibold text-ink',
  concept:
    'bg-transparent text-ink underline decoration-info decoration-dotted decoration-2 underline-offset-[3px]',
} as const;

export function Mark({ kind, children }: { kind: 'query' | 'concept'; children: ReactNode }) {
  return (
    <mark
      className={MARK_CLASS[kind]}
      data-mark={kind}
      title={kind === 'query' ? 'Your search term' : 'Related in the concept space'}
    >
      {children}
    </mark>
  );
}

/** A hit's snippet: plain text runs, some marked. Rendered as text, never as HTML. */
export function Snippet({
  segments,
  className,
}: {
  segments: SnippetSegment[];
  className?: string;
}) {
  if (segments.length === 0) return null;
  return (
    <p
      className={cn('font-document text-[14px] leading-snug text-ink-muted', className)}
      data-testid="hit-snippet"
    >
      {segments.map((segment, index) =>
        segment.mark ? (
          <Mark key={index} kind={segment.mark}>
            {segment.text}
          </Mark>
        ) : (
          <span key={index}>{segment.text}</span>
        ),
      )}
    </p>
  );
}

/** The key to the two highlight styles. */
export function HighlightLegend({ conceptTerms }: { conceptTerms?: string[] }) {
  return (
    <p
      className="flex flex-wrap items-center gap-x-4 gap-y-1 text-xs text-ink-muted"
      data-testid="highlight-legend"
    >
      <span>
        <Mark kind="query">word</Mark> your search term
      </span>
      <span>
        <Mark kind="concept">word</Mark> related in the concept space
        {conceptTerms && conceptTerms.length > 0 ? `: ${conceptTerms.slice(0, 8).join(', ')}` : ''}
      </span>
    </p>
  );
}
