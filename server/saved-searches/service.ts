import type { MatterRole } from '../../shared/roles';
import type {
  CreateSavedSearchReq,
  SavedSearch,
  SavedSearchesResponse,
} from '../../shared/schemas/saved-searches';
import { searchFiltersSchema, type SearchMode } from '../../shared/schemas/search';
import { recordAudit } from '../audit/record';
import type { Db } from '../db/database';
import { conflict, forbidden, notFound } from '../http/errors';
import {
  deleteSavedSearch,
  findSavedSearch,
  findSavedSearchByName,
  insertSavedSearch,
  listSavedSearchRows,
} from './queries';

export interface Actor {
  id: string;
  email: string;
  ip: string | null;
}

type Row = Awaited<ReturnType<typeof listSavedSearchRows>>[number];

function rowToApi(row: Row): SavedSearch {
  let filters = {};
  try {
    const parsed = searchFiltersSchema.safeParse(JSON.parse(row.filters));
    if (parsed.success) filters = parsed.data;
  } catch {
    // A stored value that no longer parses is shown without filters.
  }
  return {
    id: row.id,
    name: row.name,
    query: row.query,
    mode: row.mode as SearchMode,
    filters,
    createdBy: row.creator_name
      ? { id: row.created_by, name: row.creator_name, email: row.creator_email ?? '' }
      : null,
    createdAt: row.created_at,
  };
}

export async function listSavedSearches(db: Db, matterId: number): Promise<SavedSearchesResponse> {
  return { savedSearches: (await listSavedSearchRows(db, matterId)).map(rowToApi) };
}

export async function createSavedSearch(
  db: Db,
  matterId: number,
  input: Required<Pick<CreateSavedSearchReq, 'name' | 'query'>> &
    Omit<CreateSavedSearchReq, 'name' | 'query'>,
  actor: Actor,
) {
  if (await findSavedSearchByName(db, matterId, input.name))
    throw conflict(`A saved search named "${input.name}" already exists in this matter.`, 'name');
  const mode = input.mode ?? 'hybrid';
  const filters = input.filters ?? {};
  const id = await db.transaction().execute(async (trx) => {
    const savedId = await insertSavedSearch(trx, {
      matterId,
      name: input.name,
      query: input.query,
      mode,
      filters: JSON.stringify(filters),
      createdBy: actor.id,
    });
    await recordAudit(trx, {
      actorId: actor.id,
      actorEmail: actor.email,
      ip: actor.ip,
      matterId,
      action: 'saved_search.created',
      targetType: 'saved_search',
      targetId: savedId,
      detail: { name: input.name, query: input.query, mode, filters },
    });
    return savedId;
  });
  const row = (await listSavedSearchRows(db, matterId)).find((r) => r.id === id)!;
  return { savedSearch: rowToApi(row) };
}

/** Whoever saved it, or a lead, may delete a saved search. */
export async function removeSavedSearch(
  db: Db,
  matterId: number,
  id: number,
  role: MatterRole,
  actor: Actor,
): Promise<void> {
  const row = await findSavedSearch(db, matterId, id);
  if (!row) throw notFound('Saved search');
  if (row.created_by !== actor.id && role !== 'lead')
    throw forbidden('Only the person who saved this search, or a matter lead, may delete it.');
  await db.transaction().execute(async (trx) => {
    await deleteSavedSearch(trx, id);
    await recordAudit(trx, {
      actorId: actor.id,
      actorEmail: actor.email,
      ip: actor.ip,
      matterId,
      action: 'saved_search.deleted',
      targetType: 'saved_search',
      targetId: id,
      detail: { name: row.name, query: row.query, mode: row.mode, filters: row.filters },
    });
  });
}
