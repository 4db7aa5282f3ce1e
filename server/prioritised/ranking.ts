import { analyze } from '../engine/index';
import type { SearchFilters } from '../../shared/schemas/search';
import type { AppContext } from '../context';
import type { RankedSet } from '../search/ranking';
import { prioritisedRanking } from './service';

/**
 * The search API's 'prioritised' mode as a result set: the learned ranking's uncoded
 * documents, best first; the score bar is the model's probability of Responsive.
 */
export async function prioritisedResultSet(
  ctx: AppContext,
  matterId: number,
  input: { query?: string; filters: SearchFilters },
  cap: number,
): Promise<RankedSet> {
  const ranking = await prioritisedRanking(ctx, matterId, input, cap);
  const m = ranking.model;
  const notices = [
    `Ranked by learned model ${m.version}, trained ${m.trainedAt} on ${m.positives} Responsive and ${m.negatives} Not responsive codes (concept index version ${m.indexVersion}). It assists review and does not decide relevance.`,
  ];
  if (ranking.unscored > 0)
    notices.push(
      `${ranking.unscored} document(s) added since the model was trained are not ranked yet; they are ranked at the next retrain.`,
    );
  const capped = ranking.ids.length >= cap;
  if (ranking.ids.length === 0) notices.push('No uncoded document matches this search.');
  const queryTerms = new Set(analyze(input.query ?? ''));
  return {
    mode: 'prioritised',
    ids: ranking.ids,
    raw: ranking.scores,
    bar: ranking.scores.map((z) => 1 / (1 + Math.exp(-z))),
    duplicateOf: ranking.ids.map(() => null),
    capped,
    notices,
    knownTerms: [],
    unknownTerms: [],
    space: (await ctx.index.getIndex(matterId))?.space ?? null,
    indexVersion: m.indexVersion,
    queryVector: null,
    queryTerms,
    nearest: [],
    model: m,
  };
}
