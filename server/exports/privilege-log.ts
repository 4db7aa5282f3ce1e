import type { PrivilegeLogPatchReq, PrivilegeLogRow } from '../../shared/schemas/privilege-log';
import { TREATMENT_LABELS, documentTypeLabel } from '../../shared/schemas/privilege-log';
import { recordAudit } from '../audit/record';
import type { Db } from '../db/database';
import { notFound } from '../http/errors';

export interface Actor {
  id: string;
  email: string;
  ip: string | null;
}

const CHUNK = 900;
const dateOf = (iso: string | null) => (iso ? iso.slice(0, 10) : '');

async function chunked<T>(ids: number[], run: (slice: number[]) => Promise<T[]>) {
  const out: T[] = [];
  for (let i = 0; i < ids.length; i += CHUNK) out.push(...(await run(ids.slice(i, i + CHUNK))));
  return out;
}

/**
 * The matter's privilege log. A document is on it when it carries a code that marks
 * privilege, or when the top-level item of its family does and the document carries no
 * other code of the privilege group ("coded otherwise", e.g. Not privileged). Rows go
 * family by family (by the top-level item's control number), the top-level item first
 * and its members after it; a member without an entry of its own takes the top-level
 * item's privilege type, basis and treatment. A document with redactions in force is on it
 * as redacted, whatever its codes.
 */
export async function buildPrivilegeLog(db: Db, matterId: number): Promise<PrivilegeLogRow[]> {
  const privilegeCodes = await db
    .selectFrom('codes as c')
    .innerJoin('code_groups as g', 'g.id', 'c.group_id')
    .select(['c.id', 'c.marks_privileged'])
    .where('c.matter_id', '=', matterId)
    .where('g.kind', '=', 'privilege')
    .execute();
  const marking = await db
    .selectFrom('codes')
    .select('id')
    .where('matter_id', '=', matterId)
    .where('marks_privileged', '=', 1)
    .execute();
  const markIds = marking.map((c) => c.id);
  const otherwise = privilegeCodes.filter((c) => c.marks_privileged !== 1).map((c) => c.id);
  const coded = markIds.length
    ? await db
        .selectFrom('document_codes as dc')
        .innerJoin('documents as d', 'd.id', 'dc.document_id')
        .select(['d.id', 'd.family_id'])
        .where('d.matter_id', '=', matterId)
        .where('dc.code_id', 'in', markIds)
        .execute()
    : [];
  // A document with redactions still in force is logged too, as redacted, with the
  // redactions' reasons as its basis when no privilege entry gives one (issue 15).
  const redactions = await db
    .selectFrom('redactions as r')
    .innerJoin('documents as d', 'd.id', 'r.document_id')
    .select(['d.id', 'd.family_id', 'r.reason'])
    .where('r.matter_id', '=', matterId)
    .where('r.removed_at', 'is', null)
    .orderBy('r.id')
    .execute();
  const reasonsOf = new Map<number, string[]>();
  for (const r of redactions) {
    const list = reasonsOf.get(r.id) ?? [];
    if (!list.includes(r.reason)) list.push(r.reason);
    reasonsOf.set(r.id, list);
  }
  const privileged = [...coded, ...redactions];
  if (privileged.length === 0) return [];
  // Only a privilege code passes down a family; a redaction stays on its own document.
  const privilegedIds = new Set(coded.map((p) => p.id));
  const familyIds = [...new Set(privileged.map((p) => p.family_id ?? p.id))];
  const members = await chunked(familyIds, (slice) =>
    db
      .selectFrom('documents as d')
      .leftJoin('custodians as c', 'c.id', 'd.custodian_id')
      .select([
        'd.id',
        'd.family_id',
        'd.parent_id',
        'd.control_number',
        'd.title',
        'd.original_name',
        'd.doc_type',
        'd.mime',
        'd.author',
        'd.last_author',
        'd.email_from',
        'd.email_to',
        'd.email_cc',
        'd.email_bcc',
        'd.sent_at',
        'd.file_modified_at',
        'd.file_created_at',
        'c.name as custodian_name',
      ])
      .where('d.matter_id', '=', matterId)
      .where('d.family_id', 'in', slice)
      .execute(),
  );
  const memberIds = members.map((m) => m.id);
  const [codedOtherwise, entries, custodians] = await Promise.all([
    otherwise.length
      ? chunked(memberIds, (slice) =>
          db
            .selectFrom('document_codes')
            .select('document_id')
            .where('document_id', 'in', slice)
            .where('code_id', 'in', otherwise)
            .execute(),
        )
      : Promise.resolve([]),
    chunked(memberIds, (slice) =>
      db.selectFrom('privilege_entries').selectAll().where('document_id', 'in', slice).execute(),
    ),
    chunked(memberIds, (slice) =>
      db
        .selectFrom('document_custodians as dc')
        .innerJoin('custodians as c', 'c.id', 'dc.custodian_id')
        .select(['dc.document_id', 'c.name'])
        .where('dc.document_id', 'in', slice)
        .orderBy('c.name')
        .execute(),
    ),
  ]);
  const otherwiseIds = new Set(codedOtherwise.map((r) => r.document_id));
  const entryOf = new Map(entries.map((e) => [e.document_id, e]));
  const custodiansOf = new Map<number, string[]>();
  for (const c of custodians)
    custodiansOf.set(c.document_id, [...(custodiansOf.get(c.document_id) ?? []), c.name]);
  const byFamily = new Map<number, typeof members>();
  for (const m of members) {
    const fam = m.family_id ?? m.id;
    byFamily.set(fam, [...(byFamily.get(fam) ?? []), m]);
  }
  const families = [...byFamily.entries()]
    .map(([fam, list]) => ({
      fam,
      list: list.sort((a, b) =>
        a.id === fam ? -1 : b.id === fam ? 1 : a.control_number.localeCompare(b.control_number),
      ),
    }))
    .sort((a, b) => a.list[0].control_number.localeCompare(b.list[0].control_number));

  const rows: PrivilegeLogRow[] = [];
  for (const { fam, list } of families) {
    const topPrivileged = privilegedIds.has(fam);
    const controls = list.map((m) => m.control_number).sort();
    const isFamily = list.length > 1;
    for (const m of list) {
      const own = privilegedIds.has(m.id) || reasonsOf.has(m.id);
      const inherited = !own && topPrivileged && !otherwiseIds.has(m.id);
      if (!own && !inherited) continue;
      const entry = entryOf.get(m.id);
      const top = entryOf.get(fam);
      const source =
        entry && (entry.privilege_type || entry.basis) ? entry : inherited ? top : entry;
      rows.push({
        documentId: m.id,
        familyId: fam,
        controlNumber: m.control_number,
        familyBegin: isFamily ? controls[0] : '',
        familyEnd: isFamily ? controls[controls.length - 1] : '',
        relation: isFamily ? (m.id === fam ? 'Parent' : 'Attachment') : '',
        date: dateOf(m.sent_at ?? m.file_modified_at ?? m.file_created_at),
        author: m.author || m.last_author,
        from: m.email_from,
        to: m.email_to,
        cc: m.email_cc,
        bcc: m.email_bcc,
        subject: m.title || m.original_name,
        custodian: (custodiansOf.get(m.id) ?? (m.custodian_name ? [m.custodian_name] : [])).join(
          '; ',
        ),
        documentType: documentTypeLabel(m.doc_type, m.mime, m.original_name),
        privilegeType: source?.privilege_type ?? '',
        basis: source?.basis || (reasonsOf.get(m.id) ?? []).join('; '),
        description: entry?.description ?? '',
        treatment:
          TREATMENT_LABELS[reasonsOf.has(m.id) ? 'redacted' : (source?.treatment ?? 'withheld')],
        inherited,
      });
    }
  }
  return rows;
}

/** PATCH .../privilege-log/:docId: edits a row's fields in place; audited as privilege.updated. */
export async function patchPrivilegeLogRow(
  db: Db,
  matterId: number,
  docId: number,
  input: PrivilegeLogPatchReq,
  actor: Actor,
): Promise<{ row: PrivilegeLogRow }> {
  const rows = await buildPrivilegeLog(db, matterId);
  const row = rows.find((r) => r.documentId === docId);
  if (!row) throw notFound('Privilege log entry');
  const before = await db
    .selectFrom('privilege_entries')
    .selectAll()
    .where('document_id', '=', docId)
    .executeTakeFirst();
  const values = {
    privilege_type: input.privilegeType ?? before?.privilege_type ?? row.privilegeType,
    basis: input.basis ?? before?.basis ?? row.basis,
    description: input.description ?? before?.description ?? '',
    treatment: input.treatment ?? before?.treatment ?? 'withheld',
  };
  const at = new Date().toISOString();
  await db.transaction().execute(async (trx) => {
    await trx
      .insertInto('privilege_entries')
      .values({ document_id: docId, ...values, updated_by: actor.id, updated_at: at })
      .onConflict((oc) =>
        oc.column('document_id').doUpdateSet({ ...values, updated_by: actor.id, updated_at: at }),
      )
      .execute();
    await recordAudit(trx, {
      actorId: actor.id,
      actorEmail: actor.email,
      ip: actor.ip,
      matterId,
      action: 'privilege.updated',
      targetType: 'document',
      targetId: docId,
      detail: {
        controlNumber: row.controlNumber,
        before: before
          ? {
              privilegeType: before.privilege_type,
              basis: before.basis,
              description: before.description,
              treatment: before.treatment,
            }
          : null,
        after: values,
        source: 'privilege_log',
      },
    });
  });
  const after = (await buildPrivilegeLog(db, matterId)).find((r) => r.documentId === docId)!;
  return { row: after };
}
