import { matterParams } from '../../shared/schemas/common';
import {
  createSavedSearchSchema,
  savedSearchParams,
  type SavedSearchesResponse,
  type SavedSearchResponse,
} from '../../shared/schemas/saved-searches';
import { defineRoute } from '../http/route';
import { createSavedSearch, listSavedSearches, removeSavedSearch } from './service';

export const savedSearchRoutes = [
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/saved-searches',
    access: { matter: 'search.run' },
    schemas: { params: matterParams },
    summary: "The matter's saved searches, newest first",
    handler: ({ ctx, matter }): Promise<SavedSearchesResponse> =>
      listSavedSearches(ctx.db, matter.matterId),
  }),
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/saved-searches',
    access: { matter: 'searches.save' },
    schemas: { params: matterParams, body: createSavedSearchSchema },
    status: 201,
    summary: 'Save a search (name, query, mode, filters) for the matter',
    handler: ({ ctx, matter, body, user, ip }): Promise<SavedSearchResponse> =>
      createSavedSearch(ctx.db, matter.matterId, body, { id: user.id, email: user.email, ip }),
  }),
  defineRoute({
    method: 'delete',
    path: '/matters/:matterId/saved-searches/:savedSearchId',
    access: { matter: 'searches.save' },
    schemas: { params: savedSearchParams },
    summary: 'Delete a saved search (its author or a lead)',
    handler: ({ ctx, matter, params, user, ip }) =>
      removeSavedSearch(ctx.db, matter.matterId, params.savedSearchId, matter.role, {
        id: user.id,
        email: user.email,
        ip,
      }),
  }),
];
