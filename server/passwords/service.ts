// The matter password list: passwords a lead collected for encrypted files (PDFs), tried
// in turn when such a file is extracted. Values are stored sealed (crypto.ts), never
// returned by the API and never written to the audit trail or the log; only labels are.
import type { MatterPassword, MatterPasswordsResponse } from '../../shared/schemas/passwords';
import { recordAudit } from '../audit/record';
import type { AppContext } from '../context';
import { notFound } from '../http/errors';
import { open, passwordListKey, seal } from './crypto';

const aadOf = (matterId: number) => `quarry matter ${matterId} password`;

interface Actor {
  id: string | null;
  email: string | null;
  ip: string | null;
}

export async function listPasswords(
  ctx: AppContext,
  matterId: number,
): Promise<MatterPasswordsResponse> {
  const rows = await ctx.db
    .selectFrom('matter_passwords')
    .select(['id', 'label', 'created_at'])
    .where('matter_id', '=', matterId)
    .orderBy('id')
    .execute();
  return {
    passwords: rows.map((r): MatterPassword => ({
      id: r.id,
      label: r.label,
      createdAt: r.created_at,
    })),
  };
}

export async function addPassword(
  ctx: AppContext,
  matterId: number,
  input: { label: string; password: string },
  actor: Actor,
): Promise<{ password: MatterPassword }> {
  const key = await passwordListKey(ctx.config.dataDir);
  const sealed = seal(key, input.password, aadOf(matterId));
  const createdAt = new Date().toISOString();
  return ctx.db.transaction().execute(async (trx) => {
    const row = await trx
      .insertInto('matter_passwords')
      .values({
        matter_id: matterId,
        label: input.label,
        ciphertext: sealed.ciphertext,
        iv: sealed.iv,
        tag: sealed.tag,
        created_by: actor.id,
        created_at: createdAt,
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    await recordAudit(trx, {
      actorId: actor.id,
      actorEmail: actor.email,
      ip: actor.ip,
      matterId,
      action: 'password.added',
      targetType: 'matter',
      targetId: matterId,
      detail: { label: input.label },
    });
    return { password: { id: row.id, label: input.label, createdAt } };
  });
}

export async function removePassword(
  ctx: AppContext,
  matterId: number,
  passwordId: number,
  actor: Actor,
): Promise<void> {
  await ctx.db.transaction().execute(async (trx) => {
    const row = await trx
      .deleteFrom('matter_passwords')
      .where('matter_id', '=', matterId)
      .where('id', '=', passwordId)
      .returning('label')
      .executeTakeFirst();
    if (!row) throw notFound('Password');
    await recordAudit(trx, {
      actorId: actor.id,
      actorEmail: actor.email,
      ip: actor.ip,
      matterId,
      action: 'password.removed',
      targetType: 'matter',
      targetId: matterId,
      detail: { label: row.label },
    });
  });
}

/** The matter's passwords in the order added, for extraction only. */
export async function matterPasswords(ctx: AppContext, matterId: number): Promise<string[]> {
  const rows = await ctx.db
    .selectFrom('matter_passwords')
    .select(['ciphertext', 'iv', 'tag'])
    .where('matter_id', '=', matterId)
    .orderBy('id')
    .execute();
  if (rows.length === 0) return [];
  const key = await passwordListKey(ctx.config.dataDir);
  const out: string[] = [];
  for (const row of rows) {
    try {
      out.push(
        open(
          key,
          {
            ciphertext: Buffer.from(row.ciphertext),
            iv: Buffer.from(row.iv),
            tag: Buffer.from(row.tag),
          },
          aadOf(matterId),
        ),
      );
    } catch {
      ctx.logger.warn({ matterId }, 'a stored password could not be unsealed (key changed?)');
    }
  }
  return out;
}
