import type { Kysely, Transaction } from 'kysely';
import type { Database } from '../db/schema';

type Executor = Kysely<Database> | Transaction<Database>;

export function listSavedSearchRows(db: Executor, matterId: number) {
  return db
    .selectFrom('saved_searches as s')
    .leftJoin('users as u', 'u.id', 's.created_by')
    .select([
      's.id',
      's.name',
      's.query',
      's.mode',
      's.filters',
      's.created_by',
      's.created_at',
      'u.name as creator_name',
      'u.email as creator_email',
    ])
    .where('s.matter_id', '=', matterId)
    .orderBy('s.id', 'desc')
    .execute();
}

export function findSavedSearchByName(db: Executor, matterId: number, name: string) {
  return db
    .selectFrom('saved_searches')
    .select(['id', 'name'])
    .where('matter_id', '=', matterId)
    .where('name', '=', name)
    .executeTakeFirst();
}

export function findSavedSearch(db: Executor, matterId: number, id: number) {
  return db
    .selectFrom('saved_searches')
    .selectAll()
    .where('matter_id', '=', matterId)
    .where('id', '=', id)
    .executeTakeFirst();
}

export async function insertSavedSearch(
  db: Executor,
  values: {
    matterId: number;
    name: string;
    query: string;
    mode: string;
    filters: string;
    createdBy: string;
  },
) {
  const row = await db
    .insertInto('saved_searches')
    .values({
      matter_id: values.matterId,
      name: values.name,
      query: values.query,
      mode: values.mode,
      filters: values.filters,
      created_by: values.createdBy,
      created_at: new Date().toISOString(),
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  return row.id;
}

export async function deleteSavedSearch(db: Executor, id: number) {
  await db.deleteFrom('saved_searches').where('id', '=', id).execute();
}
