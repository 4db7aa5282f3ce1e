// Term neighbours for the "find the matter's vocabulary" view. The typed text is analysed
// exactly like a query (server/engine/text/analyzer.ts: NFKC, lower case, stop words, Porter
// stems). One known stem: its neighbours by cosine of rows of U_k S_k (term i's
// coordinates scaled by the singular values, Deerwester et al. 1990 section 4, the
// term-term comparison); several: the text as a query, against rows of U_k S_k^1/2
// (server/engine/search/explain.ts nearestTerms does both).
import type { ConceptSpace } from '../index/concept-space';
import { nearestTerms } from '../search/explain';
import { analyze } from '../text/analyzer';

export interface TermNeighbour {
  termId: number;
  term: string;
  label: string;
  similarity: number;
  df: number;
}

export interface TermNeighboursResult {
  analysed: string[];
  unknown: string[];
  neighbours: TermNeighbour[];
  notice: string | null;
}

export function termNeighbours(space: ConceptSpace, text: string, n: number): TermNeighboursResult {
  const analysed = [...new Set(analyze(text))];
  const unknown = analysed.filter((t) => space.termId(t) === undefined);
  if (analysed.length === 0) {
    return {
      analysed,
      unknown,
      neighbours: [],
      notice: `"${text}" has no index terms (only stop words, punctuation or nothing).`,
    };
  }
  if (unknown.length === analysed.length) {
    return {
      analysed,
      unknown,
      neighbours: [],
      notice: `${unknown.map((t) => `"${t}"`).join(', ')} ${unknown.length === 1 ? 'is' : 'are'} not in this matter's index (a term must occur in at least ${space.params.minDf} documents).`,
    };
  }
  // nearestTerms analyses `text` again and drops the unknown stems itself.
  const near = nearestTerms(space, text, n);
  const neighbours = near.map((t) => {
    const termId = space.termId(t.term)!;
    return { termId, term: t.term, label: t.label, similarity: t.similarity, df: space.df[termId] };
  });
  return {
    analysed,
    unknown,
    neighbours,
    notice:
      unknown.length > 0
        ? `Not in the index, left out: ${unknown.map((t) => `"${t}"`).join(', ')}.`
        : null,
  };
}
