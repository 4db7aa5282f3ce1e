import { describe, expect, it } from 'vitest';
import { searchRequestSchema } from '@shared/schemas/search';
import { parseSearchState, searchRequestFor, searchStateToParams } from './search-state';

// The address bar holds the search; the viewer rebuilds the same request from it.

describe('search state in the address bar', () => {
  it('round-trips query, mode, every filter, sort and page', () => {
    const params = new URLSearchParams(
      'q=kickbacks+to+the+buyer&mode=concept&cust=3,5&from=2020-01-01&to=2021-06-30&types=email,pdf&codes=4&uncoded=1&dups=1&sort=date&dir=asc&page=3&size=100',
    );
    const state = parseSearchState(params);
    expect(state).toMatchObject({
      query: 'kickbacks to the buyer',
      mode: 'concept',
      filters: {
        custodianIds: [3, 5],
        dateFrom: '2020-01-01',
        dateTo: '2021-06-30',
        docTypes: ['email', 'pdf'],
        codeIds: [4],
        uncodedOnly: true,
        includeDuplicates: true,
      },
      sort: { field: 'date', direction: 'asc' },
      pageIndex: 2,
      pageSize: 100,
    });
    expect(parseSearchState(searchStateToParams(state))).toEqual(state);
  });

  it('defaults to hybrid, page 1, 50 rows, and drops malformed values', () => {
    const state = parseSearchState(
      new URLSearchParams('q=x&mode=fuzzy&cust=a,0,-2&from=1st+May&sort=rank&page=0&size=7'),
    );
    expect(state.mode).toBe('hybrid');
    expect(state.filters).toEqual({});
    expect(state.sort).toBeUndefined();
    expect(state.pageIndex).toBe(0);
    expect(state.pageSize).toBe(50);
  });

  it('builds requests the shared schema accepts, with the page as offset', () => {
    const query = searchRequestFor(parseSearchState(new URLSearchParams('q=records&page=2')));
    expect(query).toMatchObject({ query: 'records', mode: 'hybrid', limit: 50, offset: 50 });
    expect(searchRequestSchema.safeParse(query).success).toBe(true);

    const like = searchRequestFor(parseSearchState(new URLSearchParams('like=12&q=ignored')));
    expect(like).toMatchObject({ mode: 'concept', similarTo: { documentId: 12 } });
    expect(like && 'query' in like).toBe(false);
    expect(searchRequestSchema.safeParse(like).success).toBe(true);

    expect(searchRequestFor(parseSearchState(new URLSearchParams('q=+++')))).toBeNull();
  });
});
