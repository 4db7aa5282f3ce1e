// Threads and near-duplicate groups of a matter, recomputed after each extraction batch
// (and when the lead changes the threshold). Both are whole-matter computations over
// stored fields and MinHash signatures, so a recomputation never re-reads originals.
import type {
  NearDuplicateSettingsResponse,
  NearDuplicatesResponse,
  ThreadNode,
  ThreadResponse,
} from '../../shared/schemas/relationships';
import { recordAudit } from '../audit/record';
import type { AppContext } from '../context';
import { notFound } from '../http/errors';
import { groupNearDuplicates, signatureFromBytes } from './minhash';
import {
  listNearDupGroup,
  listSignatures,
  listThread,
  listThreadableMessages,
  nearDupThresholdOf,
} from './queries';
import { addressesOf, buildThreads } from './threads';

export async function refreshThreads(ctx: AppContext, matterId: number): Promise<number> {
  const rows = await listThreadableMessages(ctx.db, matterId);
  const placements = buildThreads(
    rows.map((r) => ({
      id: r.id,
      messageId: r.message_id,
      inReplyTo: r.in_reply_to,
      references: r.email_references.split(/\s+/).filter(Boolean),
      subject: r.title,
      participants: addressesOf([r.email_from, r.email_to, r.email_cc].join(', ')),
      sentAt: r.sent_at,
      body: r.body ?? '',
      attachments: (r.attachment_shas ?? '').split(' ').filter(Boolean),
    })),
  );
  const update = ctx.sqlite.prepare(
    'UPDATE documents SET thread_id = ?, thread_parent_id = ?, inclusive = ? WHERE id = ?',
  );
  ctx.sqlite.transaction(() => {
    for (const p of placements) update.run(p.threadId, p.parentId, p.inclusive ? 1 : 0, p.id);
  })();
  return placements.length;
}

export async function refreshNearDuplicates(
  ctx: AppContext,
  matterId: number,
): Promise<{ groups: number; grouped: number }> {
  const threshold = await nearDupThresholdOf(ctx.db, matterId);
  const rows = await listSignatures(ctx.db, matterId);
  const members = groupNearDuplicates(
    rows.map((r) => ({
      id: r.id,
      signature: signatureFromBytes(r.signature),
      length: Number(r.length ?? 0),
    })),
    threshold,
  );
  const clear = ctx.sqlite.prepare(
    'UPDATE documents SET near_dup_group_id = NULL, near_dup_similarity = NULL WHERE matter_id = ? AND near_dup_group_id IS NOT NULL',
  );
  const set = ctx.sqlite.prepare(
    'UPDATE documents SET near_dup_group_id = ?, near_dup_similarity = ? WHERE id = ?',
  );
  ctx.sqlite.transaction(() => {
    clear.run(matterId);
    for (const m of members) set.run(m.groupId, m.similarity, m.id);
  })();
  return { groups: new Set(members.map((m) => m.groupId)).size, grouped: members.length };
}

export async function refreshRelationships(ctx: AppContext, matterId: number): Promise<void> {
  await refreshThreads(ctx, matterId);
  await refreshNearDuplicates(ctx, matterId);
}

async function documentRow(ctx: AppContext, matterId: number, docId: number) {
  const row = await ctx.db
    .selectFrom('documents')
    .select(['id', 'thread_id', 'near_dup_group_id'])
    .where('matter_id', '=', matterId)
    .where('id', '=', docId)
    .executeTakeFirst();
  if (!row) throw notFound('Document');
  return row;
}

/** The document's thread as a tree in reading order (each reply under its parent). */
export async function readThread(
  ctx: AppContext,
  matterId: number,
  docId: number,
): Promise<ThreadResponse> {
  const row = await documentRow(ctx, matterId, docId);
  if (row.thread_id === null) return { threadId: null, messages: [] };
  const rows = await listThread(ctx.db, matterId, row.thread_id);
  const ids = new Set(rows.map((r) => r.id));
  const children = new Map<number | null, typeof rows>();
  for (const r of rows) {
    const parent =
      r.thread_parent_id !== null && ids.has(r.thread_parent_id) ? r.thread_parent_id : null;
    const list = children.get(parent) ?? [];
    list.push(r);
    children.set(parent, list);
  }
  const messages: ThreadNode[] = [];
  const visit = (parent: number | null, depth: number) => {
    for (const r of children.get(parent) ?? []) {
      messages.push({
        id: r.id,
        controlNumber: r.control_number,
        title: r.title || r.original_name,
        from: r.email_from,
        sentAt: r.sent_at,
        parentId: r.thread_parent_id,
        depth,
        inclusive: r.inclusive === 1,
      });
      visit(r.id, depth + 1);
    }
  };
  visit(null, 0);
  return { threadId: row.thread_id, messages };
}

export async function readNearDuplicates(
  ctx: AppContext,
  matterId: number,
  docId: number,
): Promise<NearDuplicatesResponse> {
  const row = await documentRow(ctx, matterId, docId);
  const threshold = await nearDupThresholdOf(ctx.db, matterId);
  if (row.near_dup_group_id === null) return { groupId: null, threshold, members: [] };
  const rows = await listNearDupGroup(ctx.db, matterId, row.near_dup_group_id);
  return {
    groupId: row.near_dup_group_id,
    threshold,
    members: rows.map((r) => ({
      id: r.id,
      controlNumber: r.control_number,
      title: r.title || r.original_name,
      similarity: r.near_dup_similarity ?? 0,
      principal: r.id === row.near_dup_group_id,
    })),
  };
}

export async function changeNearDupThreshold(
  ctx: AppContext,
  matterId: number,
  threshold: number,
  actor: { id: string; email: string; ip: string | null },
): Promise<NearDuplicateSettingsResponse> {
  const previous = await nearDupThresholdOf(ctx.db, matterId);
  await ctx.db.transaction().execute(async (trx) => {
    await trx
      .updateTable('matters')
      .set({ near_dup_threshold: threshold })
      .where('id', '=', matterId)
      .execute();
    await recordAudit(trx, {
      actorId: actor.id,
      actorEmail: actor.email,
      ip: actor.ip,
      matterId,
      action: 'near_duplicates.threshold_changed',
      targetType: 'matter',
      targetId: matterId,
      detail: { from: previous, to: threshold },
    });
  });
  const result = await refreshNearDuplicates(ctx, matterId);
  return { threshold, ...result };
}
