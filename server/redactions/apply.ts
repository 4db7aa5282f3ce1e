// Where redactions fall in a document's text, and the text with them removed. Pure and
// shared by the viewer's listing (hit counts) and the production build (burned-in pages
// and the produced text file), so what a reviewer sees marked is exactly what is removed.

export interface RedactionRule {
  kind: 'span' | 'pattern' | 'box';
  start: number | null;
  end: number | null;
  pattern: string | null;
  patternKind: 'term' | 'format' | null;
  reason: string;
}

export interface RedactedRange {
  start: number;
  end: number;
  reason: string;
}

const escapeRegExp = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');

/**
 * A term matches case-insensitively with any run of white space between its words; a
 * format mask reads '#' as a digit and '@' as a letter, everything else literally, and
 * does not match inside a longer run of digits or letters. Neither form nests repetition,
 * so matching stays linear in the text (no catastrophic backtracking on hostile input).
 */
export function patternRegExp(pattern: string, kind: 'term' | 'format'): RegExp {
  if (kind === 'term') {
    const words = pattern.trim().split(/\s+/).map(escapeRegExp);
    return new RegExp(words.join('\\s+'), 'giu');
  }
  let source = '';
  for (let i = 0; i < pattern.length;) {
    const ch = pattern[i];
    let run = 1;
    while (i + run < pattern.length && pattern[i + run] === ch) run += 1;
    const count = run > 1 ? `{${run}}` : '';
    if (ch === '#') source += `[0-9]${count}`;
    else if (ch === '@') source += `\\p{L}${count}`;
    else if (/\s/.test(ch)) source += '\\s+';
    else source += escapeRegExp(ch.repeat(run));
    i += run;
  }
  const first = pattern[0];
  const last = pattern[pattern.length - 1];
  const guard = (ch: string) => (ch === '#' ? '[0-9]' : ch === '@' ? '\\p{L}' : null);
  const before = guard(first);
  const after = guard(last);
  return new RegExp(
    `${before ? `(?<!${before})` : ''}${source}${after ? `(?!${after})` : ''}`,
    'gu',
  );
}

/** Every hit of a pattern in the text, as [start, end) ranges. */
export function patternHits(
  text: string,
  pattern: string,
  kind: 'term' | 'format',
): { start: number; end: number }[] {
  const re = patternRegExp(pattern, kind);
  const hits: { start: number; end: number }[] = [];
  for (const m of text.matchAll(re)) {
    if (m[0].length === 0) continue;
    hits.push({ start: m.index, end: m.index + m[0].length });
  }
  return hits;
}

/** The ranges of the text that the rules remove, sorted and merged where they touch. */
export function redactedRanges(text: string, rules: readonly RedactionRule[]): RedactedRange[] {
  const raw: RedactedRange[] = [];
  for (const rule of rules) {
    if (rule.kind === 'span' && rule.start !== null && rule.end !== null) {
      const start = Math.max(0, Math.min(rule.start, text.length));
      const end = Math.max(start, Math.min(rule.end, text.length));
      if (end > start) raw.push({ start, end, reason: rule.reason });
    } else if (rule.kind === 'pattern' && rule.pattern) {
      for (const hit of patternHits(text, rule.pattern, rule.patternKind ?? 'term'))
        raw.push({ ...hit, reason: rule.reason });
    }
  }
  raw.sort((a, b) => a.start - b.start || b.end - a.end);
  const merged: RedactedRange[] = [];
  for (const range of raw) {
    const last = merged[merged.length - 1];
    if (last && range.start <= last.end) {
      last.end = Math.max(last.end, range.end);
      if (!last.reason.split('; ').includes(range.reason)) last.reason += `; ${range.reason}`;
    } else merged.push({ ...range });
  }
  return merged;
}

/** The marker that stands where redacted text was, in produced pages and text files. */
export const redactionMarker = (reason: string) => `[REDACTED: ${reason}]`;

/** The text with every range replaced by its marker. */
export function applyRedactions(text: string, ranges: readonly RedactedRange[]): string {
  let out = '';
  let at = 0;
  for (const range of ranges) {
    out += text.slice(at, range.start) + redactionMarker(range.reason);
    at = range.end;
  }
  return out + text.slice(at);
}

/** The strings the ranges cover (to find them again on a PDF page). */
export function redactedStrings(text: string, ranges: readonly RedactedRange[]): string[] {
  return [...new Set(ranges.map((r) => text.slice(r.start, r.end)))];
}
