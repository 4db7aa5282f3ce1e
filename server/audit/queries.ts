import type { Kysely } from 'kysely';
import type { Database } from '../db/schema';

export interface AuditFilter {
  matterId: number;
  actorId?: string;
  action?: string;
  beforeId?: number;
  limit: number;
}

/** Newest first, with the actor's current name when the account still exists. */
export function listAuditEvents(db: Kysely<Database>, filter: AuditFilter) {
  let query = db
    .selectFrom('audit_events as e')
    .leftJoin('users as u', 'u.id', 'e.actor_id')
    .select([
      'e.id',
      'e.at',
      'e.actor_id',
      'e.actor_email',
      'u.name as actor_name',
      'e.action',
      'e.target_type',
      'e.target_id',
      'e.detail',
      'e.ip',
    ])
    .where('e.matter_id', '=', filter.matterId);
  if (filter.actorId) query = query.where('e.actor_id', '=', filter.actorId);
  if (filter.action) query = query.where('e.action', '=', filter.action);
  if (filter.beforeId) query = query.where('e.id', '<', filter.beforeId);
  return query.orderBy('e.id', 'desc').limit(filter.limit).execute();
}

export function listAuditActors(db: Kysely<Database>, matterId: number) {
  return db
    .selectFrom('audit_events as e')
    .leftJoin('users as u', 'u.id', 'e.actor_id')
    .select(['e.actor_id', 'u.name', 'u.email as current_email'])
    .select((eb) => eb.fn.max('e.actor_email').as('actor_email'))
    .where('e.matter_id', '=', matterId)
    .where('e.actor_id', 'is not', null)
    .groupBy(['e.actor_id', 'u.name', 'u.email'])
    .orderBy('u.name')
    .execute();
}
