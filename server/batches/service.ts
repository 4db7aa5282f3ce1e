import type {
  Batch,
  BatchDocument,
  BatchKind,
  BatchResponse,
  BatchesResponse,
  CreateBatchesResponse,
  TeamProgressResponse,
  ReviewerProgress,
} from '../../shared/schemas/batches';
import { BATCH_DOCUMENTS_MAX } from '../../shared/schemas/batches';
import { missingRequiredGroups } from '../../shared/schemas/codes';
import { roleCan, type MatterRole } from '../../shared/roles';
import {
  searchFiltersSchema,
  type SearchFilters,
  type SearchMode,
} from '../../shared/schemas/search';
import { recordAudit } from '../audit/record';
import { loadLayout } from '../codes/service';
import type { AppContext } from '../context';
import type { Db } from '../db/database';
import { conflict, forbidden, notFound, validationError } from '../http/errors';
import { findSavedSearch } from '../saved-searches/queries';
import { filteredDocumentIds } from '../search/queries';
import { rankResultSet } from '../search/ranking';
import {
  batchCodings,
  batchDocuments,
  batchRows,
  closePlacements,
  documentsWithFamilies,
  familyMembers,
  findBatch,
  insertBatch,
  memberRole,
  openPlacements,
  updateBatch,
  type BatchRow,
} from './queries';

export interface Actor {
  id: string;
  email: string;
  ip: string | null;
}

const auditActor = (a: Actor) => ({ actorId: a.id, actorEmail: a.email, ip: a.ip });

function toBatch(row: BatchRow, complete: number): Batch {
  return {
    id: row.id,
    name: row.name,
    kind: row.kind,
    state: row.state,
    assignee:
      row.assignee_id && row.assignee_name
        ? { id: row.assignee_id, name: row.assignee_name, email: row.assignee_email ?? '' }
        : null,
    source: row.source,
    createdBy:
      row.created_by && row.creator_name
        ? { id: row.created_by, name: row.creator_name, email: row.creator_email ?? '' }
        : null,
    createdAt: row.created_at,
    assignedAt: row.assigned_at,
    checkedOutAt: row.checked_out_at,
    checkedInAt: row.checked_in_at,
    progress: { documents: Number(row.documents ?? 0), coded: Number(row.coded ?? 0), complete },
    qcSampleId: row.qc_sample_id ?? null,
  };
}

/** Documents per batch with every required group coded. */
async function completeCounts(db: Db, matterId: number, batchIds: number[]) {
  const counts = new Map<number, number>();
  if (batchIds.length === 0) return counts;
  const layout = await loadLayout(db, matterId);
  const rows = await db
    .selectFrom('review_batch_documents as bd')
    .leftJoin('document_codes as dc', 'dc.document_id', 'bd.document_id')
    .select(['bd.batch_id', 'bd.document_id', 'dc.code_id'])
    .where('bd.batch_id', 'in', batchIds)
    .execute();
  const perDoc = new Map<string, { batch: number; codes: number[] }>();
  for (const r of rows) {
    const key = `${r.batch_id}:${r.document_id}`;
    const entry = perDoc.get(key) ?? { batch: r.batch_id, codes: [] };
    if (r.code_id !== null) entry.codes.push(r.code_id);
    perDoc.set(key, entry);
  }
  for (const { batch, codes } of perDoc.values()) {
    if (missingRequiredGroups(layout.codes, layout.groups, codes).length === 0)
      counts.set(batch, (counts.get(batch) ?? 0) + 1);
  }
  return counts;
}

async function batchesById(db: Db, matterId: number, ids: number[]): Promise<Batch[]> {
  const rows = await batchRows(db, matterId, { ids });
  const complete = await completeCounts(db, matterId, ids);
  return rows.map((r) => toBatch(r, complete.get(r.id) ?? 0));
}

export interface BatchPlanInput {
  name: string;
  kind: BatchKind;
  /** In the order the batch should be worked. */
  documentIds: number[];
  /** Widen to whole families, placed together where their first member falls (default true). */
  keepFamilies?: boolean;
  /** Cap per batch; without it everything goes into one batch. */
  size?: number;
  /** A person's description of where the documents came from. */
  source?: string;
  sourceDetail?: unknown;
}

/**
 * Groups the documents into units (a whole family when keepFamilies), drops units with a
 * document already in an open batch of the kind, and packs the units in order into
 * batches of at most `size` (a family larger than the cap gets a batch of its own).
 */
async function planBatches(db: Db, matterId: number, input: BatchPlanInput) {
  const keepFamilies = input.keepFamilies ?? true;
  const ids = [...new Set(input.documentIds)];
  const known = await documentsWithFamilies(db, matterId, ids);
  const byId = new Map(known.map((d) => [d.id, d]));
  const missing = ids.filter((id) => !byId.has(id));
  if (missing.length > 0)
    throw validationError(
      'documentIds',
      `document ${missing.slice(0, 10).join(', ')} is not in this matter`,
    );
  let units: number[][];
  if (keepFamilies) {
    const familyIds = [...new Set(known.map((d) => d.family_id ?? d.id))];
    const members = new Map<number, number[]>();
    for (const m of await familyMembers(db, matterId, familyIds)) {
      const fam = m.family_id ?? m.id;
      members.set(fam, [...(members.get(fam) ?? []), m.id]);
    }
    const seen = new Set<number>();
    units = [];
    for (const id of ids) {
      const fam = byId.get(id)!.family_id ?? id;
      if (seen.has(fam)) continue;
      seen.add(fam);
      // The top-level item leads its family; the rest follow in control-number order.
      const list = members.get(fam) ?? [id];
      units.push([fam, ...list.filter((m) => m !== fam)].filter((m) => list.includes(m)));
    }
  } else {
    units = ids.map((id) => [id]);
  }
  // A validation sample is a statistical draw: two samples may share documents, so its
  // batches stand outside the one-open-batch rule (insertBatch leaves open_kind empty).
  const placed =
    input.kind === 'validation'
      ? new Set<number>()
      : await openPlacements(db, units.flat(), input.kind);
  const free = units.filter((u) => !u.some((id) => placed.has(id)));
  const skipped = units
    .filter((u) => u.some((id) => placed.has(id)))
    .reduce((n, u) => n + u.length, 0);
  const cap = input.size ?? Number.POSITIVE_INFINITY;
  const batches: number[][] = [];
  const notices: string[] = [];
  let current: number[] = [];
  for (const unit of free) {
    if (current.length > 0 && current.length + unit.length > cap) {
      batches.push(current);
      current = [];
    }
    if (unit.length > cap)
      notices.push(
        `A family of ${unit.length} documents is larger than the batch size and got a batch of its own.`,
      );
    current.push(...unit);
  }
  if (current.length > 0) batches.push(current);
  return { batches, skipped, notices };
}

async function createPlanned(
  db: Db,
  matterId: number,
  actor: Actor,
  input: BatchPlanInput,
  plan: { batches: number[][] },
  numbered: boolean,
) {
  const at = new Date().toISOString();
  return db.transaction().execute(async (trx) => {
    const ids: number[] = [];
    for (const [i, docs] of plan.batches.entries()) {
      const name = numbered ? `${input.name} ${i + 1}` : input.name;
      const id = await insertBatch(
        trx,
        {
          matterId,
          name,
          kind: input.kind,
          source: input.source ?? '',
          sourceDetail: input.sourceDetail,
          createdBy: actor.id,
          at,
        },
        docs,
      );
      ids.push(id);
      await recordAudit(trx, {
        ...auditActor(actor),
        matterId,
        action: 'batch.created',
        targetType: 'batch',
        targetId: id,
        detail: { name, kind: input.kind, documents: docs.length, source: input.source ?? '' },
      });
    }
    return ids;
  });
}

/**
 * One batch of the given documents, for features that make their own samples (validation,
 * prioritised review, QC). Families are kept whole unless keepFamilies is false; documents
 * already in an open batch of the kind are left out (with their family) and counted in
 * `skipped`. Refuses (409) when nothing is left.
 */
export async function createBatchFromDocuments(
  ctx: Pick<AppContext, 'db'>,
  matterId: number,
  actor: Actor,
  input: Omit<BatchPlanInput, 'size'>,
): Promise<{ batch: Batch; skipped: number }> {
  const plan = await planBatches(ctx.db, matterId, input);
  if (plan.batches.length === 0)
    throw conflict('Every one of these documents is already in an open batch.', 'documentIds');
  const merged = { batches: [plan.batches.flat()] };
  const [id] = await createPlanned(ctx.db, matterId, actor, input, merged, false);
  const [batch] = await batchesById(ctx.db, matterId, [id]);
  return { batch, skipped: plan.skipped };
}

/** Ids of the matter's documents in an open batch of the kind (for samples that must avoid them). */
export async function openBatchDocumentIds(db: Db, matterId: number, kind: BatchKind) {
  const rows = await db
    .selectFrom('review_batch_documents as bd')
    .innerJoin('review_batches as b', 'b.id', 'bd.batch_id')
    .select('bd.document_id')
    .where('b.matter_id', '=', matterId)
    .where('bd.open_kind', '=', kind)
    .execute();
  return new Set(rows.map((r) => r.document_id));
}

export interface CutInput {
  savedSearchId?: number;
  search?: { query?: string; mode: SearchMode; filters: SearchFilters };
  size: number;
  keepFamilies: boolean;
  name?: string;
}

/** POST .../batches: the search's documents (rank order) cut into review batches. */
export async function cutBatches(
  ctx: AppContext,
  matterId: number,
  input: CutInput,
  actor: Actor,
): Promise<CreateBatchesResponse> {
  let search = input.search;
  let label: string;
  if (input.savedSearchId !== undefined) {
    const saved = await findSavedSearch(ctx.db, matterId, input.savedSearchId);
    if (!saved) throw validationError('savedSearchId', 'is not a saved search of this matter');
    const filters = searchFiltersSchema.safeParse(JSON.parse(saved.filters || '{}'));
    search = {
      query: saved.query,
      mode: saved.mode as SearchMode,
      filters: filters.success ? filters.data : {},
    };
    label = saved.name;
  } else {
    label = search!.query?.trim() ? search!.query.trim() : 'All documents';
  }
  const query = search!.query?.trim() ?? '';
  let ids: number[];
  const notices: string[] = [];
  if (query) {
    const ranked = await rankResultSet(
      ctx,
      matterId,
      { query, mode: search!.mode, filters: { ...search!.filters, includeDuplicates: true } },
      BATCH_DOCUMENTS_MAX,
    );
    ids = ranked.ids;
    notices.push(...ranked.notices);
    if (ranked.capped)
      notices.push(`Only the first ${BATCH_DOCUMENTS_MAX} documents were batched.`);
  } else {
    ids = filteredDocumentIds(ctx.db, ctx.sqlite, matterId, search!.filters).slice(
      0,
      BATCH_DOCUMENTS_MAX,
    );
  }
  if (ids.length === 0) throw validationError('search', 'the search finds no documents to batch');
  const source =
    input.savedSearchId !== undefined
      ? `Saved search: ${label}`
      : query
        ? `Search: ${query} (${search!.mode})`
        : 'All documents passing the filters';
  const planInput: BatchPlanInput = {
    name: input.name ?? label.slice(0, 60),
    kind: 'review',
    documentIds: ids,
    keepFamilies: input.keepFamilies,
    size: input.size,
    source,
    sourceDetail: {
      savedSearchId: input.savedSearchId ?? null,
      search,
      size: input.size,
      keepFamilies: input.keepFamilies,
    },
  };
  const plan = await planBatches(ctx.db, matterId, planInput);
  if (plan.batches.length === 0)
    throw conflict('Every document of this search is already in an open batch.', 'search');
  const created = await createPlanned(ctx.db, matterId, actor, planInput, plan, true);
  return {
    batches: await batchesById(ctx.db, matterId, created),
    skipped: plan.skipped,
    notices: [...notices, ...plan.notices],
  };
}

/** Leads and attorneys see every batch; everyone else their own. */
export async function listBatches(
  db: Db,
  matterId: number,
  caller: { id: string; role: MatterRole },
  query: { mine?: boolean; kind?: BatchKind },
): Promise<BatchesResponse> {
  const all = roleCan(caller.role, 'batches.manage') && !query.mine;
  const rows = await batchRows(db, matterId, {
    assigneeId: all ? undefined : caller.id,
    kind: query.kind,
  });
  const complete = await completeCounts(
    db,
    matterId,
    rows.map((r) => r.id),
  );
  return { batches: rows.map((r) => toBatch(r, complete.get(r.id) ?? 0)) };
}

async function requireBatch(db: Db, matterId: number, batchId: number) {
  const batch = await findBatch(db, matterId, batchId);
  if (!batch) throw notFound('Batch');
  return batch;
}

/** A batch and its documents in order; reviewers may read only their own. */
export async function readBatch(
  db: Db,
  matterId: number,
  batchId: number,
  caller: { id: string; role: MatterRole },
): Promise<BatchResponse> {
  const row = await requireBatch(db, matterId, batchId);
  if (!roleCan(caller.role, 'batches.manage') && row.assignee_id !== caller.id)
    throw forbidden('This batch is assigned to someone else.');
  const layout = await loadLayout(db, matterId);
  const { docs, codes } = await batchDocuments(db, batchId);
  const byDoc = new Map<number, number[]>();
  for (const c of codes) byDoc.set(c.document_id, [...(byDoc.get(c.document_id) ?? []), c.code_id]);
  const documents: BatchDocument[] = docs.map((d) => {
    const codeIds = byDoc.get(d.id) ?? [];
    return {
      id: d.id,
      position: d.position,
      controlNumber: d.control_number,
      title: d.title || d.original_name,
      docType: d.doc_type,
      familyId: d.family_id,
      parentId: d.parent_id,
      codeIds,
      complete: missingRequiredGroups(layout.codes, layout.groups, codeIds).length === 0,
    };
  });
  const [batch] = await batchesById(db, matterId, [batchId]);
  return { batch, documents };
}

export async function assignBatch(
  db: Db,
  matterId: number,
  batchId: number,
  userId: string,
  actor: Actor,
): Promise<BatchResponse['batch']> {
  const batch = await requireBatch(db, matterId, batchId);
  if (batch.state === 'checked_in')
    throw conflict('This batch is checked in; cut a new batch to review again.');
  const member = await memberRole(db, matterId, userId);
  if (!member || member.disabled_at)
    throw validationError('userId', 'is not a member of this matter');
  if (!roleCan(member.role as MatterRole, 'documents.code'))
    throw validationError('userId', `${member.name}'s role may not code documents`);
  const at = new Date().toISOString();
  await db.transaction().execute(async (trx) => {
    await updateBatch(trx, batchId, {
      state: 'assigned',
      assignee_id: userId,
      assigned_at: at,
      checked_out_at: null,
    });
    await recordAudit(trx, {
      ...auditActor(actor),
      matterId,
      action: 'batch.assigned',
      targetType: 'batch',
      targetId: batchId,
      detail: { name: batch.name, from: batch.assignee_id, to: userId, toEmail: member.email },
    });
  });
  return (await batchesById(db, matterId, [batchId]))[0];
}

/** The reviewer takes the batch (an unassigned one becomes theirs). */
export async function checkoutBatch(
  db: Db,
  matterId: number,
  batchId: number,
  caller: { id: string; role: MatterRole },
  actor: Actor,
): Promise<Batch> {
  const batch = await requireBatch(db, matterId, batchId);
  if (batch.state === 'checked_in') throw conflict('This batch is already checked in.');
  if (batch.assignee_id && batch.assignee_id !== caller.id)
    throw forbidden('This batch is assigned to someone else.');
  if (batch.state === 'checked_out') return (await batchesById(db, matterId, [batchId]))[0];
  const at = new Date().toISOString();
  await db.transaction().execute(async (trx) => {
    await updateBatch(trx, batchId, {
      state: 'checked_out',
      assignee_id: caller.id,
      assigned_at: batch.assigned_at ?? at,
      checked_out_at: at,
    });
    await recordAudit(trx, {
      ...auditActor(actor),
      matterId,
      action: 'batch.checked_out',
      targetType: 'batch',
      targetId: batchId,
      detail: { name: batch.name },
    });
  });
  return (await batchesById(db, matterId, [batchId]))[0];
}

/**
 * The reviewer hands the batch back as done: refused (400) while a document misses a
 * required group, naming the group and the documents; a QC batch needs every call decided.
 */
export async function checkinBatch(
  db: Db,
  matterId: number,
  batchId: number,
  caller: { id: string; role: MatterRole },
  actor: Actor,
): Promise<Batch> {
  const batch = await requireBatch(db, matterId, batchId);
  if (batch.state === 'checked_in') throw conflict('This batch is already checked in.');
  if (batch.state !== 'checked_out') throw conflict('Check the batch out before checking it in.');
  if (batch.assignee_id !== caller.id && !roleCan(caller.role, 'batches.manage'))
    throw forbidden('This batch is assigned to someone else.');
  const { documents } = await readBatch(db, matterId, batchId, { id: caller.id, role: 'lead' });
  const layout = await loadLayout(db, matterId);
  const missing = new Map<string, string[]>();
  for (const d of documents) {
    for (const g of missingRequiredGroups(layout.codes, layout.groups, d.codeIds))
      missing.set(g.name, [...(missing.get(g.name) ?? []), d.controlNumber]);
  }
  if (missing.size > 0) {
    const [[group, controls]] = [...missing];
    const shown =
      controls.slice(0, 5).join(', ') +
      (controls.length > 5 ? `, and ${controls.length - 5} more` : '');
    throw validationError(
      'codes',
      `"${group}" is required and is missing on ${controls.length} document${controls.length === 1 ? '' : 's'} (${shown})`,
    );
  }
  if (batch.kind === 'qc') {
    const open = await db
      .selectFrom('qc_items as i')
      .innerJoin('qc_samples as s', 's.id', 'i.sample_id')
      .select((eb) => eb.fn.countAll<number>().as('n'))
      .where('s.batch_id', '=', batchId)
      .where('i.verdict', 'is', null)
      .executeTakeFirst();
    if (Number(open?.n ?? 0) > 0)
      throw validationError(
        'verdicts',
        `${open!.n} quality-control call${Number(open!.n) === 1 ? ' is' : 's are'} not yet confirmed or overturned`,
      );
  }
  const at = new Date().toISOString();
  await db.transaction().execute(async (trx) => {
    await updateBatch(trx, batchId, { state: 'checked_in', checked_in_at: at });
    await closePlacements(trx, batchId);
    await recordAudit(trx, {
      ...auditActor(actor),
      matterId,
      action: 'batch.checked_in',
      targetType: 'batch',
      targetId: batchId,
      detail: { name: batch.name, documents: documents.length },
    });
  });
  return (await batchesById(db, matterId, [batchId]))[0];
}

const hoursBetween = (from: string | null, to: string | null, now: number) =>
  from ? Math.max(0, ((to ? Date.parse(to) : now) - Date.parse(from)) / 3_600_000) : 0;
/** Rates over less than a minute of work say nothing. */
const rate = (n: number, hours: number) => (hours >= 1 / 60 ? n / hours : null);

/**
 * Team progress: per batch, documents coded (any code), hours from check-out to check-in
 * (or now), documents per hour and codes given by its reviewer; per reviewer, the same
 * summed over their batches with codes given by name.
 */
export async function teamProgress(db: Db, matterId: number): Promise<TeamProgressResponse> {
  const rows = await batchRows(db, matterId);
  const complete = await completeCounts(
    db,
    matterId,
    rows.map((r) => r.id),
  );
  const codings = await batchCodings(db, matterId);
  const now = Date.now();
  const batches = rows.map((r) => {
    const batch = toBatch(r, complete.get(r.id) ?? 0);
    const hours = hoursBetween(r.checked_out_at, r.checked_in_at, now);
    const codesGiven = codings.filter(
      (c) => c.batch_id === r.id && c.coded_by === r.assignee_id,
    ).length;
    return { batch, hours, documentsPerHour: rate(batch.progress.coded, hours), codesGiven };
  });
  const people = new Map<string, ReviewerProgress>();
  const coded = new Map<string, Set<number>>();
  for (const r of rows) {
    if (!r.assignee_id || !r.assignee_name) continue;
    const p =
      people.get(r.assignee_id) ??
      ({
        reviewer: { id: r.assignee_id, name: r.assignee_name, email: r.assignee_email ?? '' },
        batches: 0,
        documentsCoded: 0,
        hours: 0,
        documentsPerHour: null,
        codesGiven: 0,
        codesByName: {},
      } satisfies ReviewerProgress);
    p.batches += 1;
    p.hours += hoursBetween(r.checked_out_at, r.checked_in_at, now);
    people.set(r.assignee_id, p);
    const own = coded.get(r.assignee_id) ?? new Set<number>();
    for (const c of codings) {
      if (c.batch_id !== r.id || c.coded_by !== r.assignee_id) continue;
      own.add(c.document_id);
      p.codesGiven += 1;
      p.codesByName[c.code_name] = (p.codesByName[c.code_name] ?? 0) + 1;
    }
    coded.set(r.assignee_id, own);
  }
  for (const [id, p] of people) {
    p.documentsCoded = coded.get(id)?.size ?? 0;
    p.documentsPerHour = rate(p.documentsCoded, p.hours);
  }
  const members = await db
    .selectFrom('matter_members as m')
    .innerJoin('users as u', 'u.id', 'm.user_id')
    .select(['u.id', 'u.name', 'u.email', 'm.role'])
    .where('m.matter_id', '=', matterId)
    .where('u.disabled_at', 'is', null)
    .orderBy('u.name')
    .execute();
  return {
    batches,
    reviewers: [...people.values()].sort((a, b) => a.reviewer.name.localeCompare(b.reviewer.name)),
    assignable: members
      .filter((mm) => roleCan(mm.role as MatterRole, 'documents.code'))
      .map(({ id, name, email }) => ({ id, name, email })),
  };
}
