// analyzedTerms must be exactly the engine's analysis of a document's title and text
// (server/engine/text/analyzer.ts), which "why it matched" weights as the index did.
// Checked on every document of Cranfield 1400 (Cleverdon, Mills & Keen 1966, read from
// ../shared/data/cranfield), and on text where NFKC (Unicode Standard Annex #15) or
// lower-casing (Unicode SpecialCasing: U+0130, final sigma) changes characters, where
// the spans' tokens are not the analyzer's and the text must be analysed again.
import { describe, expect, it } from 'vitest';
import { readCranfield } from '../engine/index';
import { requireShared } from '../../tests/helpers/shared-data';
import { analyze } from '../engine/index';
import { analyzedTerms, GenerationalMemo, termSpans } from './highlight';

const present = requireShared('highlight analysis against the analyzer');

const spanTerms = (body: string) =>
  termSpans(body)
    .map((s) => s.term)
    .filter((t) => t !== null);

describe('analyzedTerms', () => {
  it.runIf(present)('equals analyze(title + body) on all 1,400 Cranfield documents', () => {
    const { docs } = readCranfield();
    expect(docs.length).toBe(1400);
    let ascii = 0;
    for (const doc of docs) {
      if (!/[\u0080-\uffff]/.test(doc.title + doc.text)) ascii++;
      const expected = analyze(`${doc.title}\n${doc.text}`);
      expect(analyzedTerms(doc.title, doc.text, termSpans(doc.text))).toEqual(expected);
    }
    // The collection is ASCII, so this exercised the reuse of the spans.
    expect(ascii).toBe(1400);
  });

  it('analyses again where Unicode normalisation or casing changes the tokens', () => {
    const cases = [
      { title: 'İstanbul office', body: 'Shipments via İstanbul and Izmir.' },
      { title: 'ΟΔΟΣ', body: "ΑΣ'Β pricing, ΟΔΟΣ terms" },
      { title: 'Ligatures', body: 'The ﬁnance team and ＦＵＬＬＷＩＤＴＨ ２０２４ figures' },
      { title: 'Résumé', body: 'naïve café déjà vu' },
    ];
    let naiveDiffers = 0;
    for (const { title, body } of cases) {
      const expected = analyze(`${title}\n${body}`);
      expect(analyzedTerms(title, body, termSpans(body))).toEqual(expected);
      const naive = [...analyze(title), ...spanTerms(body)];
      if (JSON.stringify(naive) !== JSON.stringify(expected)) naiveDiffers++;
    }
    // Reusing the spans would have been wrong for at least the dotted capital I.
    expect(naiveDiffers).toBeGreaterThan(0);
  });
});

describe('GenerationalMemo (the token -> term memo of termSpans)', () => {
  it.runIf(present)(
    'gives the uncached analysis for every Cranfield token, through many turnovers',
    () => {
      const { docs } = readCranfield();
      let computed = 0;
      const memo = new GenerationalMemo<string | null>((token) => {
        computed++;
        return analyze(token)[0] ?? null;
      }, 500);
      let tokens = 0;
      for (const doc of docs.slice(0, 400)) {
        for (const span of termSpans(doc.text)) {
          tokens++;
          const uncached = analyze(span.surface)[0] ?? null;
          expect(memo.get(span.surface)).toBe(uncached);
          expect(span.term).toBe(uncached);
        }
      }
      // Distinct words outnumber a generation many times over, yet most lookups hit.
      expect(tokens).toBeGreaterThan(30_000);
      expect(computed).toBeLessThan(tokens / 3);
    },
  );

  it('keeps a recently used entry across a turnover and forgets an unused one', () => {
    const calls: string[] = [];
    const memo = new GenerationalMemo<string>((k) => {
      calls.push(k);
      return k.toUpperCase();
    }, 2);
    memo.get('a');
    memo.get('b'); // newer {a, b}
    memo.get('c'); // turnover: older {a, b}, newer {c}
    memo.get('a'); // from the older generation, carried forward: newer {c, a}
    memo.get('d'); // turnover: older {c, a}, newer {d}; b is gone
    expect(memo.get('a')).toBe('A');
    expect(memo.get('b')).toBe('B');
    expect(calls).toEqual(['a', 'b', 'c', 'd', 'b']);
  });
});
