import type { Kysely, Transaction } from 'kysely';
import type { Database } from '../db/schema';

type Executor = Kysely<Database> | Transaction<Database>;

/** The matters a user is a member of, with their role. */
export function listMattersOfUser(db: Executor, userId: string) {
  return db
    .selectFrom('matters as m')
    .innerJoin('matter_members as mm', 'mm.matter_id', 'm.id')
    .select(['m.id', 'm.name', 'm.description', 'm.control_prefix', 'm.created_at', 'mm.role'])
    .where('mm.user_id', '=', userId)
    .orderBy('m.name')
    .execute();
}

export function findMatterById(db: Executor, matterId: number) {
  return db.selectFrom('matters').selectAll().where('id', '=', matterId).executeTakeFirst();
}

export function findMatterByNameOrPrefix(db: Executor, name: string, prefix: string) {
  return db
    .selectFrom('matters')
    .select(['id', 'name', 'control_prefix'])
    .where((eb) => eb.or([eb('name', '=', name), eb('control_prefix', '=', prefix)]))
    .executeTakeFirst();
}

export async function insertMatter(
  db: Executor,
  values: { name: string; description: string; controlPrefix: string; createdBy: string | null },
): Promise<number> {
  const row = await db
    .insertInto('matters')
    .values({
      name: values.name,
      description: values.description,
      control_prefix: values.controlPrefix,
      created_by: values.createdBy,
      created_at: new Date().toISOString(),
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  return row.id;
}

export function listAllMatters(db: Executor) {
  return db
    .selectFrom('matters as m')
    .leftJoin('matter_members as mm', 'mm.matter_id', 'm.id')
    .select(['m.id', 'm.name', 'm.description', 'm.control_prefix', 'm.created_at'])
    .select((eb) => eb.fn.count<number>('mm.user_id').as('member_count'))
    .groupBy('m.id')
    .orderBy('m.name')
    .execute();
}

/** Leads of the given matters (all matters when ids is undefined). */
export function listLeads(db: Executor, matterIds?: number[]) {
  let query = db
    .selectFrom('matter_members as mm')
    .innerJoin('users as u', 'u.id', 'mm.user_id')
    .select(['mm.matter_id', 'u.id', 'u.name', 'u.email'])
    .where('mm.role', '=', 'lead');
  if (matterIds) query = query.where('mm.matter_id', 'in', matterIds.length ? matterIds : [-1]);
  return query.orderBy('u.name').execute();
}

export async function countMembers(db: Executor, matterId: number): Promise<number> {
  const row = await db
    .selectFrom('matter_members')
    .select((eb) => eb.fn.countAll<number>().as('n'))
    .where('matter_id', '=', matterId)
    .executeTakeFirstOrThrow();
  return Number(row.n);
}

export async function countDocuments(db: Executor, matterId: number): Promise<number> {
  const row = await db
    .selectFrom('documents')
    .select((eb) => eb.fn.countAll<number>().as('n'))
    .where('matter_id', '=', matterId)
    .where('parent_id', 'is', null)
    .executeTakeFirstOrThrow();
  return Number(row.n);
}
