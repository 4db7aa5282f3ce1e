import { type ReactNode, useRef, useState } from 'react';
import type { HighlightRange } from '@shared/schemas/review';
import { PASSAGE_MAX_LENGTH } from '@shared/schemas/search';
import { Button } from '@/components/ui';
import { HighlightLegend, Mark } from '@/features/search';

/** Splits the text at the highlight ranges ([start, end) in UTF-16 units), overlaps dropped. */
function renderHighlighted(body: string, ranges: HighlightRange[]): ReactNode[] {
  const sorted = [...ranges].sort((a, b) => a.start - b.start || b.end - a.end);
  const parts: ReactNode[] = [];
  let cursor = 0;
  for (const range of sorted) {
    if (range.start < cursor || range.end <= range.start || range.start >= body.length) continue;
    if (range.start > cursor) parts.push(body.slice(cursor, range.start));
    parts.push(
      <Mark key={range.start} kind={range.mark}>
        {body.slice(range.start, range.end)}
      </Mark>,
    );
    cursor = range.end;
  }
  if (cursor < body.length) parts.push(body.slice(cursor));
  return parts;
}

/** The extracted text in the reading face, with highlights and "more like this passage". */
export function ReviewText({
  title,
  body,
  truncated,
  highlights,
  conceptTerms,
  onMoreLikePassage,
}: {
  title: string;
  body: string;
  truncated: boolean;
  highlights: HighlightRange[];
  conceptTerms: string[];
  onMoreLikePassage: (passage: string) => void;
}) {
  const textRef = useRef<HTMLDivElement>(null);
  const [passage, setPassage] = useState('');

  function readSelection() {
    const selection = window.getSelection();
    const container = textRef.current;
    if (!selection || !container || selection.rangeCount === 0) return setPassage('');
    const range = selection.getRangeAt(0);
    if (!container.contains(range.commonAncestorContainer)) return setPassage('');
    setPassage(selection.toString().trim().slice(0, PASSAGE_MAX_LENGTH));
  }

  return (
    <section
      aria-labelledby="review-text-heading"
      className="min-w-0 rounded-md border border-line bg-panel"
    >
      <div className="sticky top-0 z-10 flex flex-wrap items-center justify-between gap-2 rounded-t-md border-b border-line bg-panel/95 px-4 py-2">
        <h2 id="review-text-heading" className="text-sm font-semibold">
          Extracted text
        </h2>
        <div className="flex flex-wrap items-center gap-3">
          {highlights.length > 0 ? <HighlightLegend conceptTerms={conceptTerms} /> : null}
          <Button
            size="sm"
            disabled={passage.length < 3}
            onClick={() => onMoreLikePassage(passage)}
            title={
              passage
                ? `Find documents close in meaning to the ${passage.length} characters selected`
                : 'Select a passage in the text first'
            }
            data-testid="more-like-passage"
          >
            {passage ? 'More like the selected passage' : 'Select a passage for more like it'}
          </Button>
        </div>
      </div>
      <div
        ref={textRef}
        onMouseUp={readSelection}
        onKeyUp={readSelection}
        className="font-document max-w-[72ch] px-6 py-5 text-[16px] leading-[1.65] whitespace-pre-wrap text-ink"
        data-testid="review-text"
      >
        {title && !body.startsWith(title) ? (
          <p className="mb-3 text-lg font-semibold">{title}</p>
        ) : null}
        {body ? (
          renderHighlighted(body, highlights)
        ) : (
          <span className="text-ink-muted">This document has no text.</span>
        )}
      </div>
      {truncated ? (
        <p className="border-t border-line px-6 py-2 text-xs text-ink-muted">
          The text is cut here for reading; the full original is available to download.
        </p>
      ) : null}
    </section>
  );
}
