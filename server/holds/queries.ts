import type { Kysely, Transaction } from 'kysely';
import type { Database } from '../db/schema';

type Executor = Kysely<Database> | Transaction<Database>;

const holdColumns = [
  'h.id',
  'h.custodian_id',
  'h.reason',
  'h.set_at',
  'h.released_at',
  'h.release_reason',
  'c.name as custodian_name',
  'setter.email as set_by_email',
  'releaser.email as released_by_email',
] as const;

function holdsQuery(db: Executor, matterId: number) {
  return db
    .selectFrom('legal_holds as h')
    .leftJoin('custodians as c', 'c.id', 'h.custodian_id')
    .leftJoin('users as setter', 'setter.id', 'h.set_by')
    .leftJoin('users as releaser', 'releaser.id', 'h.released_by')
    .select(holdColumns)
    .where('h.matter_id', '=', matterId);
}

export type HoldRow = Awaited<ReturnType<typeof findHold>> & object;

export function listHolds(db: Executor, matterId: number) {
  return holdsQuery(db, matterId)
    .orderBy((eb) => eb.case().when('h.released_at', 'is', null).then(0).else(1).end())
    .orderBy('h.id', 'desc')
    .execute();
}

export function findHold(db: Executor, matterId: number, holdId: number) {
  return holdsQuery(db, matterId).where('h.id', '=', holdId).executeTakeFirst();
}

/** Active holds covering the matter as a whole or any of these custodians. */
export function activeHoldsCovering(db: Executor, matterId: number, custodianIds: number[]) {
  return holdsQuery(db, matterId)
    .where('h.released_at', 'is', null)
    .where((eb) =>
      custodianIds.length > 0
        ? eb.or([eb('h.custodian_id', 'is', null), eb('h.custodian_id', 'in', custodianIds)])
        : eb('h.custodian_id', 'is', null),
    )
    .orderBy('h.id')
    .execute();
}

export function findActiveHoldForScope(db: Executor, matterId: number, custodianId: number | null) {
  let query = db
    .selectFrom('legal_holds')
    .select(['id'])
    .where('matter_id', '=', matterId)
    .where('released_at', 'is', null);
  query =
    custodianId === null
      ? query.where('custodian_id', 'is', null)
      : query.where('custodian_id', '=', custodianId);
  return query.executeTakeFirst();
}

export async function insertHold(
  db: Executor,
  values: { matterId: number; custodianId: number | null; reason: string; setBy: string },
): Promise<number> {
  const row = await db
    .insertInto('legal_holds')
    .values({
      matter_id: values.matterId,
      custodian_id: values.custodianId,
      reason: values.reason,
      set_by: values.setBy,
      set_at: new Date().toISOString(),
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  return row.id;
}

export function markReleased(db: Executor, holdId: number, by: string, reason: string) {
  return db
    .updateTable('legal_holds')
    .set({ released_by: by, released_at: new Date().toISOString(), release_reason: reason })
    .where('id', '=', holdId)
    .where('released_at', 'is', null)
    .executeTakeFirst();
}
