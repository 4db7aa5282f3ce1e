// Legal holds: where the law wants documents kept, no one can delete them. A hold covers
// a whole matter or one custodian's documents; the matter lead sets and releases holds,
// each with a reason, and both are audited. Released holds stay listed as history.
import type {
  HoldResponse,
  HoldsResponse,
  LegalHold,
  ReleaseHoldReq,
  SetHoldReq,
} from '../../shared/schemas/holds';
import { recordAudit } from '../audit/record';
import type { Transaction } from 'kysely';
import type { Db } from '../db/database';
import type { Database } from '../db/schema';
import { findCustodianById } from '../documents/queries';
import { conflict, notFound, validationError } from '../http/errors';
import {
  activeHoldsCovering,
  findActiveHoldForScope,
  findHold,
  insertHold,
  listHolds,
  markReleased,
  type HoldRow,
} from './queries';

interface Actor {
  id: string;
  email: string;
  ip: string | null;
}

function holdToApi(row: HoldRow): LegalHold {
  return {
    id: row.id,
    custodian:
      row.custodian_id !== null ? { id: row.custodian_id, name: row.custodian_name ?? '' } : null,
    reason: row.reason,
    setBy: row.set_by_email,
    setAt: row.set_at,
    releasedBy: row.released_by_email,
    releasedAt: row.released_at,
    releaseReason: row.release_reason,
    active: row.released_at === null,
  };
}

/** How a hold is named in messages: "legal hold #3 on custodian Dana Whitlow (reason: ...)". */
export function describeHold(row: {
  id: number;
  custodian_id: number | null;
  custodian_name: string | null;
  reason: string;
}): string {
  const scope =
    row.custodian_id === null
      ? 'the whole matter'
      : `custodian ${row.custodian_name ?? row.custodian_id}`;
  return `legal hold #${row.id} on ${scope} (reason: ${row.reason})`;
}

export async function readHolds(db: Db, matterId: number): Promise<HoldsResponse> {
  return { holds: (await listHolds(db, matterId)).map(holdToApi) };
}

/**
 * Throws 409 naming the first active hold that covers the matter or any of these
 * custodians: deletion is impossible while it stands.
 */
export async function assertNotOnHold(
  db: Db | Transaction<Database>,
  matterId: number,
  custodianIds: (number | null)[],
  what: string,
): Promise<void> {
  const ids = [...new Set(custodianIds.filter((id): id is number => id !== null))];
  const holds = await activeHoldsCovering(db, matterId, ids);
  if (holds.length === 0) return;
  const first = holds[0];
  throw conflict(
    `${what} cannot be deleted: it is under ${describeHold(first)}` +
      `${holds.length > 1 ? ` and ${holds.length - 1} other hold(s)` : ''}. ` +
      'The matter lead must release the hold first.',
  );
}

export async function setHold(
  db: Db,
  matterId: number,
  body: SetHoldReq,
  actor: Actor,
): Promise<HoldResponse> {
  const custodianId = body.custodianId ?? null;
  const id = await db.transaction().execute(async (trx) => {
    let custodianName: string | null = null;
    if (custodianId !== null) {
      const custodian = await findCustodianById(trx, matterId, custodianId);
      if (!custodian)
        throw validationError(
          'custodianId',
          `custodian ${custodianId} is not a custodian of this matter`,
        );
      custodianName = custodian.name;
    }
    if (await findActiveHoldForScope(trx, matterId, custodianId))
      throw conflict(
        custodianId === null
          ? 'The whole matter is already under a legal hold.'
          : `Custodian ${custodianName} is already under a legal hold.`,
        'custodianId',
      );
    const holdId = await insertHold(trx, {
      matterId,
      custodianId,
      reason: body.reason,
      setBy: actor.id,
    });
    await recordAudit(trx, {
      actorId: actor.id,
      actorEmail: actor.email,
      ip: actor.ip,
      matterId,
      action: 'hold.set',
      targetType: 'legal_hold',
      targetId: holdId,
      detail: { custodianId, custodian: custodianName, reason: body.reason },
    });
    return holdId;
  });
  return { hold: holdToApi((await findHold(db, matterId, id))!) };
}

export async function releaseHold(
  db: Db,
  matterId: number,
  holdId: number,
  body: ReleaseHoldReq,
  actor: Actor,
): Promise<HoldResponse> {
  await db.transaction().execute(async (trx) => {
    const hold = await findHold(trx, matterId, holdId);
    if (!hold) throw notFound('Legal hold');
    if (hold.released_at !== null) throw conflict(`Legal hold #${holdId} was already released.`);
    await markReleased(trx, holdId, actor.id, body.reason);
    await recordAudit(trx, {
      actorId: actor.id,
      actorEmail: actor.email,
      ip: actor.ip,
      matterId,
      action: 'hold.released',
      targetType: 'legal_hold',
      targetId: holdId,
      detail: {
        custodianId: hold.custodian_id,
        custodian: hold.custodian_name,
        heldFor: hold.reason,
        reason: body.reason,
      },
    });
  });
  return { hold: holdToApi((await findHold(db, matterId, holdId))!) };
}
