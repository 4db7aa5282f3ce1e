import type {
  CreateRedactionReq,
  Redaction,
  RedactionsResponse,
} from '../../shared/schemas/productions';
import { createRedactionSchema } from '../../shared/schemas/productions';
import { actorOf, recordAudit } from '../audit/record';
import type { Db } from '../db/database';
import { conflict, notFound, validationError } from '../http/errors';
import { patternHits, type RedactionRule } from './apply';
import {
  findRedactableDocument,
  findRedaction,
  insertRedaction,
  listActiveRedactions,
  markRedactionRemoved,
} from './queries';

export interface Actor {
  id: string;
  email: string;
  ip: string | null;
}

type Row = Awaited<ReturnType<typeof listActiveRedactions>>[number];

/** The stored row as the rule the production build applies. */
export function ruleOf(row: {
  kind: 'span' | 'pattern' | 'box';
  start_offset: number | null;
  end_offset: number | null;
  pattern: string | null;
  pattern_kind: 'term' | 'format' | null;
  reason: string;
}): RedactionRule {
  return {
    kind: row.kind,
    start: row.start_offset,
    end: row.end_offset,
    pattern: row.pattern,
    patternKind: row.pattern_kind,
    reason: row.reason,
  };
}

function rowToApi(row: Row, body: string): Redaction {
  const isBox = row.kind === 'box';
  return {
    id: row.id,
    documentId: row.document_id,
    kind: row.kind,
    start: row.start_offset,
    end: row.end_offset,
    text:
      row.kind === 'span' && row.start_offset !== null && row.end_offset !== null
        ? body.slice(row.start_offset, row.end_offset)
        : null,
    pattern: row.pattern,
    patternKind: row.pattern_kind,
    hits:
      row.kind === 'pattern' && row.pattern
        ? patternHits(body, row.pattern, row.pattern_kind ?? 'term').length
        : null,
    page: row.page,
    box: isBox ? { x: row.x!, y: row.y!, width: row.width!, height: row.height! } : null,
    reason: row.reason,
    createdBy: row.creator_name
      ? { id: row.created_by, name: row.creator_name, email: row.creator_email ?? '' }
      : null,
    createdAt: row.created_at,
    producedIn: row.produced_in,
  };
}

async function documentOrThrow(db: Db, matterId: number, docId: number) {
  const doc = await findRedactableDocument(db, matterId, docId);
  if (!doc) throw notFound('Document');
  return doc;
}

export async function listRedactions(
  db: Db,
  matterId: number,
  docId: number,
): Promise<RedactionsResponse> {
  const doc = await documentOrThrow(db, matterId, docId);
  const rows = await listActiveRedactions(db, [docId]);
  return { redactions: rows.map((r) => rowToApi(r, doc.body ?? '')) };
}

export async function addRedaction(
  db: Db,
  matterId: number,
  docId: number,
  input: CreateRedactionReq,
  actor: Actor,
): Promise<{ redaction: Redaction }> {
  const req = createRedactionSchema.parse(input);
  const doc = await documentOrThrow(db, matterId, docId);
  const body = doc.body ?? '';
  const values = {
    matter_id: matterId,
    document_id: docId,
    kind: req.kind,
    reason: req.reason,
    created_by: actor.id,
    created_at: new Date().toISOString(),
  };
  let id: number;
  if (req.kind === 'span') {
    if (req.end <= req.start) throw validationError('end', 'must be after start');
    if (req.end > body.length)
      throw validationError('end', `must be at most ${body.length} (the length of the text)`);
    id = await insertRedaction(db, { ...values, start_offset: req.start, end_offset: req.end });
  } else if (req.kind === 'pattern') {
    if (patternHits(body, req.pattern, req.patternKind).length === 0)
      throw validationError('pattern', `has no hits in ${doc.control_number}`);
    id = await insertRedaction(db, {
      ...values,
      pattern: req.pattern,
      pattern_kind: req.patternKind,
    });
  } else {
    if (doc.mime !== 'application/pdf')
      throw validationError('kind', 'a box redaction needs a PDF page; mark text instead');
    if (doc.page_count !== null && req.page > doc.page_count)
      throw validationError('page', `must be at most ${doc.page_count} (the PDF's pages)`);
    if (req.x + req.width > 1 || req.y + req.height > 1)
      throw validationError('width', 'the box must lie inside the page');
    id = await insertRedaction(db, {
      ...values,
      page: req.page,
      x: req.x,
      y: req.y,
      width: req.width,
      height: req.height,
    });
  }
  await recordAudit(db, {
    ...actorOf(actor, actor.ip),
    matterId,
    action: 'redaction.added',
    targetType: 'document',
    targetId: docId,
    detail: {
      controlNumber: doc.control_number,
      redactionId: id,
      kind: req.kind,
      reason: req.reason,
      ...(req.kind === 'pattern' ? { pattern: req.pattern, patternKind: req.patternKind } : {}),
      ...(req.kind === 'span' ? { start: req.start, end: req.end } : {}),
      ...(req.kind === 'box' ? { page: req.page } : {}),
    },
  });
  const rows = await listActiveRedactions(db, [docId]);
  return {
    redaction: rowToApi(
      rows.find((r) => r.id === id)!,
      body,
    ),
  };
}

export async function removeRedaction(
  db: Db,
  matterId: number,
  docId: number,
  redactionId: number,
  actor: Actor,
): Promise<void> {
  const doc = await documentOrThrow(db, matterId, docId);
  const row = await findRedaction(db, matterId, docId, redactionId);
  if (!row) throw notFound('Redaction');
  if (row.produced_in !== null)
    throw conflict(
      `This redaction was burned into production ${row.produced_in} and can no longer be removed.`,
    );
  await markRedactionRemoved(db, redactionId, actor.id);
  await recordAudit(db, {
    ...actorOf(actor, actor.ip),
    matterId,
    action: 'redaction.removed',
    targetType: 'document',
    targetId: docId,
    detail: { controlNumber: doc.control_number, redactionId, kind: row.kind, reason: row.reason },
  });
}
