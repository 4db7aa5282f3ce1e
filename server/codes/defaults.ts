import type { Transaction } from 'kysely';
import { DEFAULT_CODE_GROUPS } from '../../shared/schemas/codes';
import type { Database } from '../db/schema';

/**
 * The matter-created step (server/matters/hooks.ts): every new matter, the demo matter
 * included, starts with the default layout (DEFAULT_CODE_GROUPS): Responsiveness
 * (single-choice, required), Privilege (Privileged / Not privileged, with type and
 * basis), Flags (Hot, Needs second look) and an empty Issues group the lead fills.
 * Existing matters got the same groups from migration 2026_12_04_1401.
 */
export async function createDefaultCodes(trx: Transaction<Database>, matterId: number) {
  const now = new Date().toISOString();
  let order = 0;
  for (const [index, group] of DEFAULT_CODE_GROUPS.entries()) {
    const row = await trx
      .insertInto('code_groups')
      .values({
        matter_id: matterId,
        name: group.name,
        kind: group.kind,
        required: group.required ? 1 : 0,
        follow_family: group.followFamily ? 1 : 0,
        follow_duplicates: group.followDuplicates ? 1 : 0,
        sort_order: (index + 1) * 10,
        created_at: now,
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    if (group.codes.length === 0) continue;
    await trx
      .insertInto('codes')
      .values(
        group.codes.map((code) => ({
          matter_id: matterId,
          name: code.name,
          shortcut: code.shortcut,
          sort_order: (order += 10),
          marks_privileged: code.marksPrivileged ? 1 : 0,
          archived_at: null,
          created_at: now,
          group_id: row.id,
          colour: code.colour,
        })),
      )
      .execute();
  }
}
