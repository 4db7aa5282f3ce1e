import { matterParams } from '../../shared/schemas/common';
import { documentParams } from '../../shared/schemas/documents';
import {
  RECENT_SEARCHES_MAX,
  type RecentSearchesResponse,
} from '../../shared/schemas/saved-searches';
import {
  searchRequestSchema,
  similarQuerySchema,
  type SearchResponse,
} from '../../shared/schemas/search';
import { defineRoute } from '../http/route';
import { recentSearches, runSearch } from './service';

export const searchRoutes = [
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/search',
    access: { matter: 'search.run' },
    schemas: { params: matterParams, body: searchRequestSchema },
    summary: 'Concept, keyword or hybrid search, or "more like this" (similarTo); audited',
    handler: ({ ctx, matter, body, user, ip }): Promise<SearchResponse> =>
      runSearch(ctx, matter.matterId, body, { id: user.id, email: user.email, ip }),
  }),
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/documents/:docId/similar',
    access: { matter: 'search.run' },
    schemas: { params: documentParams, query: similarQuerySchema },
    summary: 'More like this document (concept space); audited as a search',
    handler: ({ ctx, matter, params, query, user, ip }): Promise<SearchResponse> =>
      runSearch(
        ctx,
        matter.matterId,
        {
          mode: 'concept',
          similarTo: { documentId: params.docId },
          filters: {},
          limit: query.limit,
          offset: query.offset,
        },
        { id: user.id, email: user.email, ip },
      ),
  }),
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/searches/recent',
    access: { matter: 'search.run' },
    schemas: { params: matterParams },
    summary: "The caller's last 20 distinct searches in the matter",
    handler: ({ ctx, matter, user }): Promise<RecentSearchesResponse> =>
      recentSearches(ctx, matter.matterId, user.id, RECENT_SEARCHES_MAX),
  }),
];
