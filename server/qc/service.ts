import { randomInt } from 'node:crypto';
import type {
  CreateQcSampleReq,
  OverturnRatesResponse,
  QcCriteria,
  QcDecisionReq,
  QcItem,
  QcSample,
  QcSampleResponse,
  QcSamplesResponse,
} from '../../shared/schemas/qc';
import { roleCan, type MatterRole } from '../../shared/roles';
import { recordAudit } from '../audit/record';
import { createBatchFromDocuments } from '../batches/service';
import { applyCoding, loadLayout } from '../codes/service';
import type { Db } from '../db/database';
import { conflict, forbidden, notFound, validationError } from '../http/errors';
import { decidedCalls, eligibleCalls, itemRows, sampleRows } from './queries';
import { drawSample, overturnRates, sizeOfShare } from './sample';

export interface Actor {
  id: string;
  email: string;
  ip: string | null;
}

const auditActor = (a: Actor) => ({ actorId: a.id, actorEmail: a.email, ip: a.ip });
const person = (id: string | null, name: string | null, email: string | null) =>
  id && name ? { id, name, email: email ?? '' } : null;

type SampleRow = Awaited<ReturnType<typeof sampleRows>>[number];
type ItemRow = Awaited<ReturnType<typeof itemRows>>[number];

function toSample(r: SampleRow): QcSample {
  return {
    id: r.id,
    batchId: r.batch_id,
    batchName: r.batch_name,
    method: r.method,
    seed: r.seed,
    share: r.share,
    requested: r.requested,
    population: r.population,
    size: Number(r.size ?? 0),
    criteria: JSON.parse(r.criteria) as QcCriteria,
    createdBy: person(r.created_by, r.creator_name, r.creator_email),
    createdAt: r.created_at,
    decided: Number(r.decided ?? 0),
    calls: Number(r.calls ?? 0),
  };
}

function toItem(r: ItemRow): QcItem {
  return {
    id: r.id,
    documentId: r.document_id,
    controlNumber: r.control_number,
    title: r.title || r.original_name,
    code: { id: r.code_id, name: r.code_name },
    firstCoder: person(r.first_coder_id, r.first_name, r.first_email),
    verdict: r.verdict,
    replacementCode:
      r.replacement_code_id !== null && r.replacement_name
        ? { id: r.replacement_code_id, name: r.replacement_name }
        : null,
    decidedBy: person(r.decided_by, r.decider_name, r.decider_email),
    decidedAt: r.decided_at,
    note: r.note,
  };
}

/**
 * POST .../qc/samples: draws the documents (random share or count with a recorded seed, or
 * every eligible document for a targeted sample), puts them in a QC batch and records one
 * item per first-level call on them that matches the criteria.
 */
export async function drawQcSample(
  db: Db,
  matterId: number,
  input: Omit<CreateQcSampleReq, 'criteria'> & { criteria: QcCriteria },
  actor: Actor,
): Promise<QcSampleResponse> {
  const layout = await loadLayout(db, matterId);
  if (input.criteria.codeId && !layout.codes.some((c) => c.id === input.criteria.codeId))
    throw validationError('criteria.codeId', 'is not a code of this matter');
  const calls = await eligibleCalls(db, matterId, input.criteria);
  const population = [...new Set(calls.map((c) => c.document_id))];
  if (population.length === 0)
    throw validationError(
      'criteria',
      'no first-level calls match (documents already checked are left out)',
    );
  const seed = input.method === 'targeted' ? null : (input.seed ?? randomInt(0, 2 ** 32 - 1));
  const n =
    input.method === 'targeted'
      ? population.length
      : input.method === 'share'
        ? sizeOfShare(population.length, input.share!)
        : Math.min(input.count!, population.length);
  const chosen = seed === null ? population : drawSample(population, n, seed);
  const describe = [
    input.method === 'share' ? `${Math.round(input.share! * 1000) / 10}% random` : null,
    input.method === 'count' ? `${n} random` : null,
    input.method === 'targeted' ? 'targeted' : null,
  ]
    .filter(Boolean)
    .join('');
  const { batch } = await createBatchFromDocuments({ db }, matterId, actor, {
    name: input.name ?? `QC ${describe}`,
    kind: 'qc',
    documentIds: chosen,
    keepFamilies: false,
    source: `Quality control: ${describe}${seed !== null ? `, seed ${seed}` : ''}`,
    sourceDetail: { method: input.method, seed, criteria: input.criteria },
  });
  const chosenSet = new Set(chosen);
  const sampleId = await db.transaction().execute(async (trx) => {
    const row = await trx
      .insertInto('qc_samples')
      .values({
        matter_id: matterId,
        batch_id: batch.id,
        method: input.method,
        seed,
        share: input.share ?? null,
        requested: input.count ?? null,
        population: population.length,
        criteria: JSON.stringify(input.criteria),
        created_by: actor.id,
        created_at: new Date().toISOString(),
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    const items = calls.filter((c) => chosenSet.has(c.document_id));
    for (let i = 0; i < items.length; i += 300) {
      await trx
        .insertInto('qc_items')
        .values(
          items.slice(i, i + 300).map((c) => ({
            sample_id: row.id,
            document_id: c.document_id,
            code_id: c.code_id,
            first_coder_id: c.coded_by,
            first_coded_at: c.coded_at,
            verdict: null,
            replacement_code_id: null,
            decided_by: null,
            decided_at: null,
          })),
        )
        .execute();
    }
    await recordAudit(trx, {
      ...auditActor(actor),
      matterId,
      action: 'qc.sample_drawn',
      targetType: 'qc_sample',
      targetId: row.id,
      detail: {
        method: input.method,
        seed,
        share: input.share ?? null,
        count: input.count ?? null,
        population: population.length,
        size: chosen.length,
        calls: items.length,
        criteria: input.criteria,
        batchId: batch.id,
      },
    });
    return row.id;
  });
  return readQcSample(db, matterId, sampleId, { id: actor.id, role: 'lead' });
}

export async function listQcSamples(db: Db, matterId: number): Promise<QcSamplesResponse> {
  return { samples: (await sampleRows(db, matterId)).map(toSample) };
}

async function assigneeOf(db: Db, batchId: number) {
  return await db
    .selectFrom('review_batches')
    .select(['assignee_id', 'state'])
    .where('id', '=', batchId)
    .executeTakeFirst();
}

export async function readQcSample(
  db: Db,
  matterId: number,
  sampleId: number,
  caller: { id: string; role: MatterRole },
): Promise<QcSampleResponse> {
  const [row] = await sampleRows(db, matterId, [sampleId]);
  if (!row) throw notFound('QC sample');
  const batch = await assigneeOf(db, row.batch_id);
  if (!roleCan(caller.role, 'qc.manage') && batch?.assignee_id !== caller.id)
    throw forbidden('This quality-control batch is assigned to someone else.');
  return { sample: toSample(row), items: (await itemRows(db, { matterId, sampleId })).map(toItem) };
}

/**
 * Confirms or overturns one call. Overturning removes the code (or replaces it with the
 * right code of its group); either verdict locks the document's coding until the lead
 * unlocks it. Audited as qc.decided (and the coding change as coding.changed, source qc).
 */
export async function decideQcItem(
  db: Db,
  matterId: number,
  itemId: number,
  input: QcDecisionReq,
  caller: { id: string; role: MatterRole },
  actor: Actor,
): Promise<{ item: QcItem }> {
  const [row] = await itemRows(db, { matterId, itemId });
  if (!row) throw notFound('QC call');
  const batch = await assigneeOf(db, row.batch_id);
  if (batch?.assignee_id !== caller.id && !roleCan(caller.role, 'qc.manage'))
    throw forbidden('This quality-control batch is assigned to someone else.');
  if (batch?.state === 'checked_in') throw conflict('This quality-control batch is checked in.');
  if (row.verdict !== null) throw conflict(`This call was already ${row.verdict}.`);
  const layout = await loadLayout(db, matterId);
  const code = layout.codes.find((c) => c.id === row.code_id)!;
  let replacement: number | null = null;
  if (input.verdict === 'overturned' && input.replacementCodeId) {
    const r = layout.codes.find((c) => c.id === input.replacementCodeId);
    if (!r || r.groupId !== code.groupId || r.id === code.id || r.archivedAt)
      throw validationError(
        'replacementCodeId',
        `must be another active code of the group "${code.name}" is in`,
      );
    replacement = r.id;
  }
  if (input.verdict === 'confirmed' && input.replacementCodeId)
    throw validationError('replacementCodeId', 'is only given when overturning');
  if (input.verdict === 'overturned') {
    await applyCoding(
      db,
      matterId,
      (current) => {
        const now = [...(current.get(row.document_id) ?? [])].filter((id) => id !== row.code_id);
        return [{ documentId: row.document_id, wanted: replacement ? [...now, replacement] : now }];
      },
      [row.document_id],
      actor,
      { source: 'qc', ignoreLocks: true },
    );
  }
  const at = new Date().toISOString();
  await db.transaction().execute(async (trx) => {
    await trx
      .updateTable('qc_items')
      .set({
        verdict: input.verdict,
        replacement_code_id: replacement,
        decided_by: actor.id,
        decided_at: at,
        note: input.note ?? '',
      })
      .where('id', '=', itemId)
      .execute();
    await trx
      .insertInto('coding_locks')
      .values({
        document_id: row.document_id,
        matter_id: matterId,
        sample_id: row.sample_id,
        locked_by: actor.id,
        locked_at: at,
      })
      .onConflict((oc) => oc.doNothing())
      .execute();
    await recordAudit(trx, {
      ...auditActor(actor),
      matterId,
      action: 'qc.decided',
      targetType: 'document',
      targetId: row.document_id,
      detail: {
        itemId,
        sampleId: row.sample_id,
        controlNumber: row.control_number,
        code: row.code_name,
        firstCoderId: row.first_coder_id,
        verdict: input.verdict,
        replacementCodeId: replacement,
        note: input.note ?? '',
      },
    });
  });
  const [after] = await itemRows(db, { matterId, itemId });
  return { item: toItem(after) };
}

/** DELETE .../documents/:docId/lock (qc.manage): the lead lets a QC-checked document be recoded. */
export async function unlockDocument(db: Db, matterId: number, docId: number, actor: Actor) {
  const lock = await db
    .selectFrom('coding_locks')
    .selectAll()
    .where('document_id', '=', docId)
    .where('matter_id', '=', matterId)
    .executeTakeFirst();
  if (!lock) throw notFound('Coding lock');
  await db.transaction().execute(async (trx) => {
    await trx.deleteFrom('coding_locks').where('document_id', '=', docId).execute();
    await recordAudit(trx, {
      ...auditActor(actor),
      matterId,
      action: 'coding.unlocked',
      targetType: 'document',
      targetId: docId,
      detail: { sampleId: lock.sample_id, lockedAt: lock.locked_at, lockedBy: lock.locked_by },
    });
  });
}

/** GET .../qc/overturn-rates: overturned / checked per first-level reviewer and per code. */
export async function readOverturnRates(db: Db, matterId: number): Promise<OverturnRatesResponse> {
  const rows = await decidedCalls(db, matterId);
  const calls = rows.map((r) => ({
    reviewerId: r.first_coder_id,
    codeId: r.code_id,
    verdict: r.verdict,
  }));
  const byReviewer = overturnRates(calls, (c) => c.reviewerId);
  const byCode = overturnRates(calls, (c) => c.codeId);
  const overall = overturnRates(calls, () => 'all').get('all') ?? {
    checked: 0,
    overturned: 0,
    rate: null,
  };
  const names = new Map(
    rows.map((r) => [r.first_coder_id, { name: r.coder_name, email: r.coder_email }]),
  );
  const codeNames = new Map(rows.map((r) => [r.code_id, r.code_name]));
  return {
    byReviewer: [...byReviewer]
      .filter(([id]) => id !== null)
      .map(([id, rate]) => ({
        ...rate,
        reviewer: { id: id!, name: names.get(id)?.name ?? id!, email: names.get(id)?.email ?? '' },
      }))
      .sort((a, b) => a.reviewer.name.localeCompare(b.reviewer.name)),
    byCode: [...byCode].map(([id, rate]) => ({
      ...rate,
      code: { id, name: codeNames.get(id) ?? String(id) },
    })),
    overall,
  };
}
