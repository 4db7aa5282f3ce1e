import {
  missingRequiredGroups,
  resolveWanted,
  type AppliedCode,
  type BulkCodingResponse,
  type Code,
  type CodeColour,
  type CodeGroup,
  type CodeGroupResponse,
  type CodesResponse,
  type CreateCodeGroupReq,
  type CreateCodeReq,
  type DocumentCodesResponse,
  type DocumentCoding,
  type PrivilegeFieldsReq,
  type RuleCode,
  type UpdateCodeGroupReq,
  type UpdateCodeReq,
} from '../../shared/schemas/codes';
import { recordAudit } from '../audit/record';
import type { Transaction } from 'kysely';
import type { Db } from '../db/database';
import type { Database } from '../db/schema';
import { conflict, notFound, validationError } from '../http/errors';
import {
  addDocumentCodes,
  documentFacts,
  duplicatesOfRoots,
  existingDocumentIds,
  familyOf,
  findGroup,
  insertGroup,
  listGroups,
  privilegeEntriesOf,
  upsertPrivilegeFields,
  findCode,
  findCodeByName,
  findCodeByShortcut,
  findCodesByIds,
  insertCode,
  listAppliedCodes,
  listCodesWithCounts,
  nextSortOrder,
  removeDocumentCodes,
  updateCode,
} from './queries';

export interface Actor {
  id: string;
  email: string;
  ip: string | null;
}

const auditActor = (actor: Actor) => ({ actorId: actor.id, actorEmail: actor.email, ip: actor.ip });

type CodeRowWithCount = Awaited<ReturnType<typeof listCodesWithCounts>>[number];
type AppliedRow = Awaited<ReturnType<typeof listAppliedCodes>>[number];

function codeRowToApi(row: CodeRowWithCount): Code {
  return {
    id: row.id,
    name: row.name,
    shortcut: row.shortcut,
    sortOrder: row.sort_order,
    marksPrivileged: row.marks_privileged === 1,
    archivedAt: row.archived_at,
    documentCount: Number(row.document_count ?? 0),
    groupId: row.group_id,
    colour: row.colour as CodeColour,
  };
}

type GroupRow = Awaited<ReturnType<typeof listGroups>>[number];

function groupRowToApi(row: GroupRow): CodeGroup {
  return {
    id: row.id,
    name: row.name,
    kind: row.kind,
    required: row.required === 1,
    followFamily: row.follow_family === 1,
    followDuplicates: row.follow_duplicates === 1,
    sortOrder: row.sort_order,
  };
}

/** The matter's coding layout: every code (archived too) and group, for the rules. */
export async function loadLayout(
  db: Db,
  matterId: number,
): Promise<{ codes: Code[]; groups: CodeGroup[] }> {
  return listCodes(db, matterId);
}

function appliedRowToApi(row: AppliedRow): AppliedCode {
  return {
    id: row.code_id,
    name: row.name,
    codedBy:
      row.coded_by && row.coder_name
        ? { id: row.coded_by, name: row.coder_name, email: row.coder_email ?? '' }
        : null,
    codedAt: row.coded_at,
  };
}

export async function listCodes(db: Db, matterId: number): Promise<CodesResponse> {
  const [codes, groups] = await Promise.all([
    listCodesWithCounts(db, matterId),
    listGroups(db, matterId),
  ]);
  return { codes: codes.map(codeRowToApi), groups: groups.map(groupRowToApi) };
}

export async function createCodeGroup(
  db: Db,
  matterId: number,
  input: CreateCodeGroupReq,
  actor: Actor,
): Promise<CodeGroupResponse> {
  const groups = await listGroups(db, matterId);
  if (groups.some((g) => g.name.toLowerCase() === input.name.toLowerCase()))
    throw conflict(`The matter already has a group named "${input.name}".`, 'name');
  if (input.kind === 'privilege' && groups.some((g) => g.kind === 'privilege'))
    throw conflict('The matter already has its privilege group.', 'kind');
  const id = await db.transaction().execute(async (trx) => {
    const groupId = await insertGroup(trx, {
      matterId,
      name: input.name,
      kind: input.kind,
      required: input.required ?? false,
      followFamily: input.followFamily ?? false,
      followDuplicates: input.followDuplicates ?? false,
      sortOrder: Math.max(0, ...groups.map((g) => g.sort_order)) + 10,
    });
    await recordAudit(trx, {
      ...auditActor(actor),
      matterId,
      action: 'code_group.created',
      targetType: 'code_group',
      targetId: groupId,
      detail: { ...input },
    });
    return groupId;
  });
  return { group: groupRowToApi((await findGroup(db, matterId, id))!) };
}

export async function changeCodeGroup(
  db: Db,
  matterId: number,
  groupId: number,
  input: UpdateCodeGroupReq,
  actor: Actor,
): Promise<CodeGroupResponse> {
  const before = await findGroup(db, matterId, groupId);
  if (!before) throw notFound('Code group');
  if (input.name !== undefined) {
    const clash = (await listGroups(db, matterId)).find(
      (g) => g.id !== groupId && g.name.toLowerCase() === input.name!.toLowerCase(),
    );
    if (clash) throw conflict(`The matter already has a group named "${clash.name}".`, 'name');
  }
  const set: Record<string, string | number> = {};
  if (input.name !== undefined) set.name = input.name;
  if (input.required !== undefined) set.required = input.required ? 1 : 0;
  if (input.followFamily !== undefined) set.follow_family = input.followFamily ? 1 : 0;
  if (input.followDuplicates !== undefined) set.follow_duplicates = input.followDuplicates ? 1 : 0;
  if (input.sortOrder !== undefined) set.sort_order = input.sortOrder;
  await db.transaction().execute(async (trx) => {
    await trx.updateTable('code_groups').set(set).where('id', '=', groupId).execute();
    await recordAudit(trx, {
      ...auditActor(actor),
      matterId,
      action: 'code_group.updated',
      targetType: 'code_group',
      targetId: groupId,
      detail: { before: groupRowToApi(before), changes: input },
    });
  });
  return { group: groupRowToApi((await findGroup(db, matterId, groupId))!) };
}

/** A code's group: the one named, else the first multi-choice group (issue codes). */
async function groupFor(db: Db, matterId: number, groupId: number | undefined) {
  const groups = await listGroups(db, matterId);
  if (groupId !== undefined) {
    const g = groups.find((x) => x.id === groupId);
    if (!g) throw validationError('groupId', 'is not a code group of this matter');
    return g;
  }
  return groups.find((g) => g.kind === 'multi') ?? groups[0] ?? null;
}

async function codeById(db: Db, matterId: number, codeId: number): Promise<Code> {
  const row = (await listCodesWithCounts(db, matterId)).find((c) => c.id === codeId);
  if (!row) throw notFound('Code');
  return codeRowToApi(row);
}

async function assertFree(
  db: Db,
  matterId: number,
  values: { name?: string; shortcut?: string | null },
  codeId?: number,
) {
  if (values.name !== undefined) {
    const clash = await findCodeByName(db, matterId, values.name);
    if (clash && clash.id !== codeId)
      throw conflict(`The matter already has a code named "${clash.name}".`, 'name');
  }
  if (values.shortcut) {
    const clash = await findCodeByShortcut(db, matterId, values.shortcut);
    if (clash && clash.id !== codeId)
      throw conflict(`The key "${values.shortcut}" already applies "${clash.name}".`, 'shortcut');
  }
}

export async function createCode(
  db: Db,
  matterId: number,
  input: CreateCodeReq,
  actor: Actor,
): Promise<Code> {
  const name = input.name;
  const shortcut = input.shortcut ?? null;
  await assertFree(db, matterId, { name, shortcut });
  const group = await groupFor(db, matterId, input.groupId as number | undefined);
  if (input.marksPrivileged && group && group.kind !== 'privilege')
    throw validationError(
      'marksPrivileged',
      'only a code of the privilege group can mark privilege',
    );
  const id = await db.transaction().execute(async (trx) => {
    const codeId = await insertCode(trx, {
      matterId,
      name,
      shortcut,
      marksPrivileged: input.marksPrivileged ?? false,
      sortOrder: await nextSortOrder(trx, matterId),
      groupId: group?.id ?? null,
      colour: input.colour ?? 'blue',
    });
    await recordAudit(trx, {
      ...auditActor(actor),
      matterId,
      action: 'code.created',
      targetType: 'code',
      targetId: codeId,
      detail: {
        name,
        shortcut,
        marksPrivileged: input.marksPrivileged ?? false,
        groupId: group?.id ?? null,
      },
    });
    return codeId;
  });
  return codeById(db, matterId, id);
}

export async function changeCode(
  db: Db,
  matterId: number,
  codeId: number,
  input: UpdateCodeReq,
  actor: Actor,
): Promise<Code> {
  const before = await findCode(db, matterId, codeId);
  if (!before) throw notFound('Code');
  await assertFree(db, matterId, input, codeId);
  const set: Parameters<typeof updateCode>[2] = {};
  if (input.name !== undefined) set.name = input.name;
  if (input.shortcut !== undefined) set.shortcut = input.shortcut;
  if (input.marksPrivileged !== undefined) set.marks_privileged = input.marksPrivileged ? 1 : 0;
  if (input.sortOrder !== undefined) set.sort_order = input.sortOrder;
  if (input.archived !== undefined)
    set.archived_at = input.archived ? (before.archived_at ?? new Date().toISOString()) : null;
  if (input.groupId !== undefined) set.group_id = (await groupFor(db, matterId, input.groupId))!.id;
  if (input.colour !== undefined) set.colour = input.colour;
  await db.transaction().execute(async (trx) => {
    await updateCode(trx, codeId, set);
    await recordAudit(trx, {
      ...auditActor(actor),
      matterId,
      action: input.archived === true && !before.archived_at ? 'code.archived' : 'code.updated',
      targetType: 'code',
      targetId: codeId,
      detail: {
        before: {
          name: before.name,
          shortcut: before.shortcut,
          marksPrivileged: before.marks_privileged === 1,
          sortOrder: before.sort_order,
          archived: before.archived_at !== null,
          groupId: before.group_id,
          colour: before.colour,
        },
        changes: input,
      },
    });
  });
  return codeById(db, matterId, codeId);
}

/** DELETE archives: the code stays on documents already coded (and in the audit log). */
export async function archiveCode(db: Db, matterId: number, codeId: number, actor: Actor) {
  return changeCode(db, matterId, codeId, { archived: true }, actor);
}

/** Applied codes per document, for search hits, the viewer and coding answers. */
export async function appliedCodesOf(db: Db, documentIds: number[]) {
  const byDoc = new Map<number, AppliedCode[]>();
  for (const id of documentIds) byDoc.set(id, []);
  for (const row of await listAppliedCodes(db, documentIds))
    byDoc.get(row.document_id)?.push(appliedRowToApi(row));
  return byDoc;
}

/** Checks that every code is the matter's; `forAdding` also refuses archived codes. */
async function checkCodes(
  db: Db,
  matterId: number,
  ids: number[],
  field: string,
  forAdding: boolean,
) {
  const unique = [...new Set(ids)];
  const rows = await findCodesByIds(db, matterId, unique);
  const found = new Map(rows.map((r) => [r.id, r]));
  const missing = unique.filter((id) => !found.has(id));
  if (missing.length > 0)
    throw validationError(field, `code ${missing.join(', ')} is not a code of this matter`);
  if (forAdding) {
    const archived = rows.filter((r) => r.archived_at !== null);
    if (archived.length > 0)
      throw validationError(field, `code "${archived[0].name}" is archived and cannot be applied`);
  }
  return unique;
}

async function checkDocuments(db: Db, matterId: number, ids: number[]) {
  const unique = [...new Set(ids)];
  const found = await existingDocumentIds(db, matterId, unique);
  const missing = unique.filter((id) => !found.has(id));
  if (missing.length > 0) {
    const shown = missing.slice(0, 10).join(', ');
    throw validationError(
      'documentIds',
      `document ${shown}${missing.length > 10 ? ', ...' : ''} is not in this matter`,
    );
  }
  return unique;
}

export type CodingSource = 'single' | 'bulk' | 'family' | 'duplicate' | 'qc';

interface Change {
  documentId: number;
  added: number[];
  removed: number[];
  replaced: { groupId: number; from: number; to: number }[];
  source: CodingSource;
  /** The document a propagated change came from. */
  from?: number;
}

interface Layout {
  codes: RuleCode[];
  groups: CodeGroup[];
}

/** The set a document ends with after a change. */
const applied = (current: Set<number>, c: Change) => {
  const next = new Set(current);
  for (const id of c.removed) next.delete(id);
  for (const id of c.added) next.add(id);
  return next;
};

/**
 * The changes a group's family / duplicate setting carries from each primary change to the
 * other documents: an added code replaces the target's code of a single-choice group; a
 * removed code is removed. Targets that are primary documents themselves, or locked by
 * quality control, are left alone.
 */
async function propagate(
  db: Db | Transaction<Database>,
  matterId: number,
  layout: Layout,
  primary: Change[],
  current: Map<number, Set<number>>,
): Promise<Change[]> {
  const groupOf = new Map(
    layout.codes.map((c) => [c.id, layout.groups.find((g) => g.id === c.groupId)]),
  );
  const follows = (codeId: number, what: 'followFamily' | 'followDuplicates') =>
    Boolean(groupOf.get(codeId)?.[what]);
  const wants = primary.filter((c) =>
    [...c.added, ...c.removed].some(
      (id) => follows(id, 'followFamily') || follows(id, 'followDuplicates'),
    ),
  );
  if (wants.length === 0) return [];
  const facts = new Map(
    (
      await documentFacts(
        db,
        matterId,
        wants.map((c) => c.documentId),
      )
    ).map((f) => [f.id, f]),
  );
  const families = await familyOf(db, matterId, [
    ...new Set([...facts.values()].map((f) => f.family_id ?? f.id)),
  ]);
  const roots = [...new Set([...facts.values()].map((f) => f.duplicate_of ?? f.id))];
  const dups = await duplicatesOfRoots(db, matterId, roots);
  const primaryIds = new Set(primary.map((c) => c.documentId));
  const plans = new Map<number, Change>();
  for (const change of wants) {
    const f = facts.get(change.documentId)!;
    const root = f.duplicate_of ?? f.id;
    const familyTargets = families
      .filter((d) => d.family_id === (f.family_id ?? f.id))
      .map((d) => d.id);
    const dupTargets = dups.filter((d) => (d.duplicate_of ?? d.id) === root).map((d) => d.id);
    for (const [targets, what, source] of [
      [familyTargets, 'followFamily', 'family'],
      [dupTargets, 'followDuplicates', 'duplicate'],
    ] as const) {
      const added = change.added.filter((id) => follows(id, what));
      const removed = change.removed.filter((id) => follows(id, what));
      if (added.length + removed.length === 0) continue;
      for (const target of targets) {
        if (primaryIds.has(target)) continue;
        const plan = plans.get(target) ?? {
          documentId: target,
          added: [],
          removed: [],
          replaced: [],
          source,
          from: change.documentId,
        };
        plan.added.push(...added.filter((id) => !plan.added.includes(id)));
        plan.removed.push(...removed.filter((id) => !plan.removed.includes(id)));
        plans.set(target, plan);
      }
    }
  }
  if (plans.size === 0) return [];
  const targetIds = [...plans.keys()];
  const targetFacts = await documentFacts(db, matterId, targetIds);
  const locked = new Set(targetFacts.filter((f) => f.locked_at).map((f) => f.id));
  for (const row of await listAppliedCodes(db, targetIds)) {
    const set = current.get(row.document_id) ?? new Set<number>();
    set.add(row.code_id);
    current.set(row.document_id, set);
  }
  const out: Change[] = [];
  for (const plan of plans.values()) {
    if (locked.has(plan.documentId)) continue;
    const now = current.get(plan.documentId) ?? new Set<number>();
    const wanted = applied(now, { ...plan, added: [], removed: plan.removed });
    const added = plan.added.filter((id) => !now.has(id));
    const resolved = resolveWanted(layout.codes, layout.groups, [...wanted], [...wanted, ...added]);
    if (!resolved.ok) continue;
    const final = new Set(resolved.codeIds);
    out.push({
      ...plan,
      added: [...final].filter((id) => !now.has(id)),
      removed: [...now].filter((id) => !final.has(id)),
      replaced: resolved.replaced,
    });
  }
  return out.filter((c) => c.added.length + c.removed.length > 0);
}

export interface CodingOptions {
  source: CodingSource;
  /** Privilege type / basis / description given with the coding. */
  privilege?: PrivilegeFieldsReq;
  /** The reviewer is moving on: required groups must be coded. */
  complete?: boolean;
  /** Quality control changes a locked document itself. */
  ignoreLocks?: boolean;
}

/**
 * Plans and applies coding in one transaction: single-choice replacement, the privilege
 * type and basis a privilege code needs, required groups when moving on, family and
 * duplicate propagation; ONE coding.changed audit row per document changed.
 */
export async function applyCoding(
  db: Db,
  matterId: number,
  plan: (current: Map<number, Set<number>>) => { documentId: number; wanted: number[] }[],
  documentIds: number[],
  actor: Actor,
  options: CodingOptions,
): Promise<{ primary: Change[]; propagated: Change[] }> {
  const layout = await loadLayout(db, matterId);
  const byId = new Map(layout.codes.map((c) => [c.id, c]));
  return db.transaction().execute(async (trx) => {
    const current = new Map<number, Set<number>>();
    for (const id of documentIds) current.set(id, new Set());
    for (const row of await listAppliedCodes(trx, documentIds))
      current.get(row.document_id)?.add(row.code_id);
    const primary: Change[] = [];
    for (const { documentId, wanted } of plan(current)) {
      const now = current.get(documentId) ?? new Set<number>();
      const resolved = resolveWanted(layout.codes, layout.groups, [...now], wanted);
      if (!resolved.ok) throw validationError('codeIds', resolved.message);
      const final = resolved.codeIds;
      if (options.complete) {
        const missing = missingRequiredGroups(layout.codes, layout.groups, final);
        if (missing.length > 0) {
          const g = missing[0];
          const names = layout.codes
            .filter((c) => c.groupId === g.id && !c.archivedAt)
            .map((c) => c.name);
          throw validationError('codeIds', `"${g.name}" is required: choose ${names.join(' or ')}`);
        }
      }
      primary.push({
        documentId,
        added: final.filter((id) => !now.has(id)),
        removed: [...now].filter((id) => !final.includes(id)),
        replaced: resolved.replaced,
        source: options.source,
      });
    }
    const changedPrimary = primary.filter((c) => c.added.length + c.removed.length > 0);
    const propagated = await propagate(trx, matterId, layout, changedPrimary, current);
    const all = [...changedPrimary, ...propagated];
    const at = new Date().toISOString();

    // A privilege code needs its type and basis: given now, or already on the document.
    const privilegedNow = (c: Change) =>
      c.added.find((id) => byId.get(id)?.marksPrivileged) ?? null;
    const needing = all.filter((c) => privilegedNow(c) !== null);
    if (needing.length > 0) {
      const entries = new Map(
        (
          await privilegeEntriesOf(
            trx,
            needing.map((c) => c.documentId),
          )
        ).map((e) => [e.document_id, e]),
      );
      const given = options.privilege ?? {};
      const sourceEntry = (c: Change) => (c.from !== undefined ? entries.get(c.from) : undefined);
      for (const c of needing) {
        const existing = entries.get(c.documentId) ?? sourceEntry(c);
        const isPrimary = c.from === undefined;
        const type = (isPrimary ? given.type : undefined) ?? existing?.privilege_type ?? '';
        const basis = (isPrimary ? given.basis : undefined) ?? existing?.basis ?? '';
        const name = byId.get(privilegedNow(c)!)!.name;
        if (isPrimary && !type)
          throw validationError('privilege.type', `is required when "${name}" is chosen`);
        if (isPrimary && !basis)
          throw validationError('privilege.basis', `is required when "${name}" is chosen`);
        const values = {
          privilege_type: type,
          basis,
          description: (isPrimary ? given.description : undefined) ?? existing?.description ?? '',
          treatment: (isPrimary ? given.treatment : undefined) ?? existing?.treatment ?? 'withheld',
        };
        await upsertPrivilegeFields(trx, c.documentId, values, actor.id, at);
        entries.set(c.documentId, {
          ...values,
          document_id: c.documentId,
          updated_by: actor.id,
          updated_at: at,
        });
      }
    } else if (options.privilege && Object.keys(options.privilege).length > 0) {
      // Fields given without a new privilege code update documents already privileged.
      for (const { documentId } of primary) {
        const codes = current.get(documentId) ?? new Set<number>();
        if (![...codes].some((id) => byId.get(id)?.marksPrivileged)) continue;
        const [existing] = await privilegeEntriesOf(trx, [documentId]);
        await upsertPrivilegeFields(
          trx,
          documentId,
          {
            privilege_type: options.privilege.type ?? existing?.privilege_type ?? '',
            basis: options.privilege.basis ?? existing?.basis ?? '',
            description: options.privilege.description ?? existing?.description ?? '',
            treatment: options.privilege.treatment ?? existing?.treatment ?? 'withheld',
          },
          actor.id,
          at,
        );
      }
    }

    await addDocumentCodes(
      trx,
      all.flatMap((c) => c.added.map((codeId) => ({ documentId: c.documentId, codeId }))),
      actor.id,
      at,
    );
    await removeDocumentCodes(
      trx,
      all.flatMap((c) => c.removed.map((codeId) => ({ documentId: c.documentId, codeId }))),
    );
    const nameOf = (id: number) => byId.get(id)?.name ?? String(id);
    for (const change of all) {
      await recordAudit(trx, {
        ...auditActor(actor),
        matterId,
        action: 'coding.changed',
        targetType: 'document',
        targetId: change.documentId,
        detail: {
          added: change.added,
          removed: change.removed,
          addedNames: change.added.map(nameOf),
          removedNames: change.removed.map(nameOf),
          replaced: change.replaced.map((r) => ({
            ...r,
            fromName: nameOf(r.from),
            toName: nameOf(r.to),
          })),
          source: change.source,
          ...(change.from !== undefined ? { fromDocumentId: change.from } : {}),
        },
      });
    }
    return { primary: changedPrimary, propagated };
  });
}

async function lockedIds(db: Db, matterId: number, ids: number[]) {
  return new Set(
    (await documentFacts(db, matterId, ids)).filter((f) => f.locked_at).map((f) => f.id),
  );
}

/** PUT .../documents/:docId/codes: the document's codes become exactly codeIds (single-choice rules apply). */
export async function setDocumentCodes(
  db: Db,
  matterId: number,
  documentId: number,
  input: { codeIds: number[]; privilege?: PrivilegeFieldsReq; complete?: boolean },
  actor: Actor,
): Promise<DocumentCodesResponse> {
  const found = await existingDocumentIds(db, matterId, [documentId]);
  if (!found.has(documentId)) throw notFound('Document');
  if ((await lockedIds(db, matterId, [documentId])).size > 0)
    throw conflict(
      'Quality control has checked this document: its coding is locked until the matter lead unlocks it.',
    );
  const wanted = await checkCodes(db, matterId, input.codeIds, 'codeIds', false);
  // Archived codes may stay on a document, but not be newly applied.
  const before = new Set(
    ((await appliedCodesOf(db, [documentId])).get(documentId) ?? []).map((c) => c.id),
  );
  const newlyAdded = wanted.filter((id) => !before.has(id));
  if (newlyAdded.length > 0) await checkCodes(db, matterId, newlyAdded, 'codeIds', true);
  const { primary, propagated } = await applyCoding(
    db,
    matterId,
    () => [{ documentId, wanted }],
    [documentId],
    actor,
    { source: 'single', privilege: input.privilege, complete: input.complete },
  );
  const [change] = primary;
  const appliedNow = await appliedCodesOf(db, [documentId, ...propagated.map((p) => p.documentId)]);
  return {
    documentId,
    codes: appliedNow.get(documentId) ?? [],
    added: change?.added ?? [],
    removed: change?.removed ?? [],
    replaced: change?.replaced ?? [],
    propagated: propagated.map((p) => ({
      documentId: p.documentId,
      codes: appliedNow.get(p.documentId) ?? [],
    })),
  };
}

/** POST .../codes/bulk: add and remove on many documents (whole families on request). */
export async function bulkCode(
  db: Db,
  matterId: number,
  input: {
    documentIds: number[];
    add: number[];
    remove: number[];
    withFamilies?: boolean;
    privilege?: PrivilegeFieldsReq;
  },
  actor: Actor,
): Promise<BulkCodingResponse> {
  let documentIds = await checkDocuments(db, matterId, input.documentIds);
  const add = await checkCodes(db, matterId, input.add, 'add', true);
  const remove = await checkCodes(db, matterId, input.remove, 'remove', false);
  const layout = await loadLayout(db, matterId);
  for (const group of layout.groups) {
    if (group.kind === 'multi') continue;
    const inGroup = add.filter((id) => layout.codes.find((c) => c.id === id)?.groupId === group.id);
    if (inGroup.length > 1)
      throw validationError('add', `"${group.name}" takes one code; add only one of its codes`);
  }
  if (input.withFamilies) {
    const facts = await documentFacts(db, matterId, documentIds);
    const fams = await familyOf(db, matterId, [...new Set(facts.map((f) => f.family_id ?? f.id))]);
    documentIds = [...new Set([...documentIds, ...fams.map((f) => f.id)])];
  }
  const locked = await lockedIds(db, matterId, documentIds);
  const open = documentIds.filter((id) => !locked.has(id));
  const { primary, propagated } = await applyCoding(
    db,
    matterId,
    (current) =>
      open.map((documentId) => {
        const now = current.get(documentId) ?? new Set<number>();
        // An added single-choice code replaces the group's current one (resolveWanted).
        const kept = [...now].filter((id) => !remove.includes(id));
        return { documentId, wanted: [...new Set([...kept, ...add])] };
      }),
    open,
    actor,
    { source: 'bulk', privilege: input.privilege },
  );
  const ids = [...open, ...propagated.map((p) => p.documentId)];
  const appliedNow = await appliedCodesOf(db, ids);
  const documents: DocumentCoding[] = ids.map((documentId) => ({
    documentId,
    codes: appliedNow.get(documentId) ?? [],
  }));
  return {
    changed: primary.length + propagated.length,
    unchanged: open.length - primary.length,
    locked: locked.size,
    documents,
  };
}
