import { sql, type ExpressionBuilder, type Kysely } from 'kysely';
import type { Database } from '../db/schema';

type AuditEb = ExpressionBuilder<Database & { e: Database['audit_events'] }, 'e'>;

/**
 * A matter's log: its own events, plus the account events (sign-in, failed sign-in,
 * sign-out, password change) of the people who are or were its members, so the lead
 * sees who signed in. Former members are those a member.* event or an accepted
 * invitation of this matter names.
 */
function inMatterScope(eb: AuditEb, matterId: number) {
  return eb.or([
    eb('e.matter_id', '=', matterId),
    eb.and([
      eb('e.matter_id', 'is', null),
      eb('e.action', 'like', 'auth.%'),
      eb(
        'e.actor_id',
        'in',
        sql<string>`(
          SELECT user_id FROM matter_members WHERE matter_id = ${matterId}
          UNION SELECT target_id FROM audit_events
            WHERE matter_id = ${matterId} AND target_type = 'user' AND action LIKE 'member.%'
          UNION SELECT actor_id FROM audit_events
            WHERE matter_id = ${matterId} AND action = 'invitation.accepted'
        )`,
      ),
    ]),
  ]);
}

export interface AuditFilter {
  matterId: number;
  actorId?: string;
  action?: string;
  beforeId?: number;
  /** Inclusive ISO timestamps (the CSV export's day range). */
  atFrom?: string;
  atBefore?: string;
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
    .where((eb) => inMatterScope(eb, filter.matterId));
  if (filter.actorId) query = query.where('e.actor_id', '=', filter.actorId);
  if (filter.action) query = query.where('e.action', '=', filter.action);
  if (filter.beforeId) query = query.where('e.id', '<', filter.beforeId);
  if (filter.atFrom) query = query.where('e.at', '>=', filter.atFrom);
  if (filter.atBefore) query = query.where('e.at', '<', filter.atBefore);
  return query.orderBy('e.id', 'desc').limit(filter.limit).execute();
}

export function listAuditActors(db: Kysely<Database>, matterId: number) {
  return db
    .selectFrom('audit_events as e')
    .leftJoin('users as u', 'u.id', 'e.actor_id')
    .select(['e.actor_id', 'u.name', 'u.email as current_email'])
    .select((eb) => eb.fn.max('e.actor_email').as('actor_email'))
    .where((eb) => inMatterScope(eb, matterId))
    .where('e.actor_id', 'is not', null)
    .groupBy(['e.actor_id', 'u.name', 'u.email'])
    .orderBy('u.name')
    .execute();
}
