import type { Transaction } from 'kysely';
import { DEFAULT_CODES } from '../../shared/schemas/codes';
import type { Database } from '../db/schema';

/**
 * The matter-created step (server/matters/hooks.ts): every new matter, the demo matter
 * included, starts with Responsive, Not responsive, Privileged (on the privilege log),
 * Hot and Needs second look. The lead edits the set afterwards.
 */
export async function createDefaultCodes(trx: Transaction<Database>, matterId: number) {
  const now = new Date().toISOString();
  await trx
    .insertInto('codes')
    .values(
      DEFAULT_CODES.map((code, index) => ({
        matter_id: matterId,
        name: code.name,
        shortcut: code.shortcut,
        sort_order: (index + 1) * 10,
        marks_privileged: code.marksPrivileged ? 1 : 0,
        archived_at: null,
        created_at: now,
      })),
    )
    .execute();
}
