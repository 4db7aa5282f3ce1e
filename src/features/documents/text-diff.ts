// Word-level difference of two texts for the side-by-side near-duplicate view: the longest
// common subsequence of words (Hunt and McIlroy, "An algorithm for differential file
// comparison", 1976), by dynamic programming over the part between a common prefix and
// suffix. Long texts are compared line by line instead, to bound the work.

export type DiffPart = { kind: 'same' | 'removed' | 'added'; text: string };

const MAX_CELLS = 4_000_000;

function lcsDiff(a: string[], b: string[], join: string): DiffPart[] {
  let start = 0;
  while (start < a.length && start < b.length && a[start] === b[start]) start += 1;
  let endA = a.length;
  let endB = b.length;
  while (endA > start && endB > start && a[endA - 1] === b[endB - 1]) {
    endA -= 1;
    endB -= 1;
  }
  const midA = a.slice(start, endA);
  const midB = b.slice(start, endB);
  const n = midA.length;
  const m = midB.length;
  const parts: DiffPart[] = [];
  const push = (kind: DiffPart['kind'], text: string) => {
    const last = parts.at(-1);
    if (last && last.kind === kind) last.text += join + text;
    else parts.push({ kind, text });
  };
  for (const w of a.slice(0, start)) push('same', w);
  if (n * m > MAX_CELLS) {
    for (const w of midA) push('removed', w);
    for (const w of midB) push('added', w);
  } else {
    // table[i][j] = LCS length of midA[i..] and midB[j..].
    const table = Array.from({ length: n + 1 }, () => new Uint32Array(m + 1));
    for (let i = n - 1; i >= 0; i -= 1)
      for (let j = m - 1; j >= 0; j -= 1)
        table[i][j] =
          midA[i] === midB[j]
            ? table[i + 1][j + 1] + 1
            : Math.max(table[i + 1][j], table[i][j + 1]);
    let i = 0;
    let j = 0;
    while (i < n && j < m) {
      if (midA[i] === midB[j]) {
        push('same', midA[i]);
        i += 1;
        j += 1;
      } else if (table[i + 1][j] >= table[i][j + 1]) push('removed', midA[i++]);
      else push('added', midB[j++]);
    }
    while (i < n) push('removed', midA[i++]);
    while (j < m) push('added', midB[j++]);
  }
  for (const w of a.slice(endA)) push('same', w);
  return parts;
}

/** Differences from `principal` to `other`, word by word (line by line for long texts). */
export function diffTexts(principal: string, other: string): DiffPart[] {
  const a = principal.split(/\s+/).filter(Boolean);
  const b = other.split(/\s+/).filter(Boolean);
  if (a.length * b.length <= MAX_CELLS * 4) return lcsDiff(a, b, ' ');
  return lcsDiff(principal.split('\n'), other.split('\n'), '\n');
}
