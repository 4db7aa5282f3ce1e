// The build-production job: numbers every page of the set in family order (parent, then
// its attachments, depth first), renders each document in the page-rendering worker,
// and writes the zip: PDF/<first Bates>.pdf, TEXT/<first Bates>.txt, NATIVES/<first
// Bates>.<ext> where natives travel, DATA/metadata.csv and manifest.json (SHA-256 of
// every other file). Numbering is page-level and without gaps; on success the
// production is locked and its redactions are marked as produced.
import { createHash } from 'node:crypto';
import { createWriteStream } from 'node:fs';
import { mkdir, readFile, rename, rm, stat } from 'node:fs/promises';
import path from 'node:path';
import type { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import yazl from 'yazl';
import { PRODUCTION_METADATA_COLUMNS } from '../../shared/schemas/productions';
import { recordAudit } from '../audit/record';
import type { AppContext } from '../context';
import { toCsv } from '../exports/csv';
import type { JobHandler, JobRun } from '../jobs/runner';
import {
  applyRedactions,
  patternHits,
  redactedRanges,
  redactedStrings,
  type RedactionRule,
} from '../redactions/apply';
import { listActiveRedactions } from '../redactions/queries';
import { ruleOf } from '../redactions/service';
import {
  allCustodiansOf,
  codesOf,
  documentsForBuild,
  findProductionRow,
  listProductionDocuments,
} from './queries';
import { batesNumber, type Box, type RenderTask } from './render-core';
import { RenderPool } from './render-pool';
import { productionZipPath, type BuildProductionPayload } from './service';

type Doc = Awaited<ReturnType<typeof documentsForBuild>>[number];

const TEXT_LIKE = new Set([
  'text/plain',
  'text/markdown',
  'text/html',
  'message/rfc822',
  'application/vnd.ms-outlook',
  'application/vnd.openxmlformats-officedocument.wordprocessingml.document',
  'application/vnd.openxmlformats-officedocument.presentationml.presentation',
]);

export const WITHHELD_PRIVILEGED = 'Document withheld on the ground of privilege';
export const WITHHELD_FAMILY = 'Family member not produced';
export const NATIVE_NOTICE = 'Document produced in native format';
export const NO_IMAGE_NOTICE = 'No text or image is available for this document';

const dateText = (iso: string | null) =>
  iso ? `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC`.trim() : '';

/** Family order: families by their top-level control number, each depth first. */
export function familyOrder(
  docs: readonly {
    id: number;
    parent_id: number | null;
    family_id: number | null;
    control_number: string;
  }[],
): number[] {
  const byId = new Map(docs.map((d) => [d.id, d]));
  const children = new Map<number, typeof docs>();
  const roots: (typeof docs)[number][] = [];
  for (const d of docs) {
    if (d.parent_id !== null && byId.has(d.parent_id))
      children.set(d.parent_id, [...(children.get(d.parent_id) ?? []), d]);
    else roots.push(d);
  }
  const byControl = (a: { control_number: string }, b: { control_number: string }) =>
    a.control_number.localeCompare(b.control_number);
  roots.sort(byControl);
  const out: number[] = [];
  const visit = (d: (typeof docs)[number]) => {
    out.push(d.id);
    for (const c of [...(children.get(d.id) ?? [])].sort(byControl)) visit(c);
  };
  for (const r of roots) visit(r);
  return out;
}

function extensionOf(name: string) {
  const ext = path.extname(name).toLowerCase();
  return /^\.[a-z0-9]{1,8}$/.test(ext) ? ext : '.bin';
}

interface Planned {
  treatment: 'produced' | 'redacted' | 'withheld' | 'native';
  task: Omit<RenderTask, 'stamp' | 'tmpDir'>;
  text: string;
  native: boolean;
}

/** Decides how one document goes out, and what its pages and text file hold. */
function plan(
  doc: Doc,
  origin: string,
  rules: RedactionRule[],
  boxes: Box[],
  privileged: boolean,
  mode: 'withhold' | 'redact',
  natives: string,
  originalPath: string,
): Planned {
  const title = doc.title || doc.text_title || doc.original_name;
  const slip = (notice: string): Planned => ({
    treatment: 'withheld',
    task: {
      kind: 'slip',
      originalPath: null,
      title: '',
      header: [],
      body: '',
      redactStrings: [],
      boxes: [],
      notice,
    },
    text: `${notice}\r\n`,
    native: false,
  });
  if (origin === 'slip-sheet') return slip(WITHHELD_FAMILY);
  const redacting = rules.length > 0 || boxes.length > 0;
  // Nothing privileged leaves unredacted: without redactions it is withheld in either mode.
  if (privileged && (mode === 'withhold' || !redacting)) return slip(WITHHELD_PRIVILEGED);

  const body = doc.body ?? '';
  const ranges = redactedRanges(body, rules);
  const redactedBody = applyRedactions(body, ranges);
  const patterns = rules.filter((r) => r.kind === 'pattern');
  const scrub = (value: string) => applyRedactions(value, redactedRanges(value, patterns));
  const isEmail = doc.mime === 'message/rfc822' || doc.mime === 'application/vnd.ms-outlook';
  const header = isEmail
    ? [
        { label: 'From', value: doc.email_from || doc.author },
        { label: 'To', value: doc.email_to || doc.recipients },
        { label: 'Cc', value: doc.email_cc },
        { label: 'Bcc', value: doc.email_bcc },
        { label: 'Date', value: dateText(doc.sent_at) },
        { label: 'Subject', value: title },
      ]
        .filter((h) => h.value)
        .map((h) => ({ label: h.label, value: scrub(h.value) }))
    : [];
  const shownTitle = isEmail ? '' : scrub(title);
  const textFile = [
    ...header.map((h) => `${h.label}: ${h.value}`),
    ...(shownTitle ? [shownTitle] : []),
    '',
    redactedBody,
  ]
    .join('\r\n')
    .trimStart();
  // Strings to find and paint over on PDF pages: spans and pattern hits in the body, and
  // pattern hits anywhere (a title on the page may repeat a redacted term).
  const strings = [
    ...redactedStrings(body, ranges),
    ...patterns.flatMap((p) =>
      patternHits(doc.title ?? '', p.pattern!, p.patternKind ?? 'term').map((h) =>
        (doc.title ?? '').slice(h.start, h.end),
      ),
    ),
  ];
  const base = {
    originalPath: null,
    title: shownTitle,
    header,
    body: redactedBody,
    redactStrings: [] as string[],
    boxes: [] as Box[],
    notice: '',
  };
  const isPdf = doc.mime === 'application/pdf' && doc.extract_status !== 'failed';
  if (isPdf)
    return {
      treatment: redacting ? 'redacted' : 'produced',
      task: { ...base, kind: 'pdf', originalPath, redactStrings: strings, boxes },
      text: textFile,
      native: natives === 'all' && !redacting,
    };
  const hasText = body.trim().length > 0;
  const paginates = TEXT_LIKE.has(doc.mime) && doc.extract_status !== 'failed';
  if (redacting || (paginates && hasText) || (natives === 'none' && hasText))
    return {
      treatment: redacting ? 'redacted' : 'produced',
      task: { ...base, kind: 'text' },
      text: textFile,
      native: natives === 'all' && !redacting,
    };
  if (natives === 'none')
    return {
      treatment: 'produced',
      task: { ...base, kind: 'placeholder', title: shownTitle, notice: NO_IMAGE_NOTICE },
      text: textFile,
      native: false,
    };
  return {
    treatment: 'native',
    task: { ...base, kind: 'placeholder', title: doc.original_name, notice: NATIVE_NOTICE },
    text: textFile,
    native: true,
  };
}

const sha256 = (data: Uint8Array | string) => createHash('sha256').update(data).digest('hex');

async function build(ctx: AppContext, pool: RenderPool, run: JobRun<BuildProductionPayload>) {
  const { productionId } = run.payload;
  const matterId = run.job.matter_id!;
  const production = await findProductionRow(ctx.db, matterId, productionId);
  if (!production) return 'the production no longer exists';
  const members = await listProductionDocuments(ctx.db, productionId);
  const ids = members.map((m) => m.document_id);
  const docs = await documentsForBuild(ctx.db, matterId, ids);
  const byId = new Map(docs.map((d) => [d.id, d]));
  const originOf = new Map(members.map((m) => [m.document_id, m.origin]));
  const order = familyOrder(docs);
  const custodians = await allCustodiansOf(ctx.db, ids);
  const { codes, privileged } = await codesOf(ctx.db, ids);
  const redactionRows = await listActiveRedactions(ctx.db, ids);
  const legendCodes = JSON.parse(production.legend_codes) as { codeId: number; legend: string }[];

  const zipPath = productionZipPath(ctx, matterId, productionId);
  await mkdir(path.dirname(zipPath), { recursive: true });
  const partial = `${zipPath}.part`;
  const tmpDir = path.join(ctx.config.tmpDir, `production-${productionId}`);
  await mkdir(tmpDir, { recursive: true });
  const zip = new yazl.ZipFile();
  const written = pipeline(zip.outputStream, createWriteStream(partial));
  const manifest: { path: string; sha256: string; size: number }[] = [];
  const mtime = new Date();
  const add = (name: string, data: Buffer, compress: boolean) => {
    zip.addBuffer(data, name, { mtime, compress });
    manifest.push({ path: name, sha256: sha256(data), size: data.length });
  };

  const placed: {
    doc: Doc;
    begin: number;
    end: number;
    treatment: string;
    legend: string;
    nativeName: string;
    textName: string;
    redacted: boolean;
  }[] = [];
  let seq = production.bates_start;
  try {
    for (const [position, id] of order.entries()) {
      if (run.signal.aborted) throw new Error('stopped because the server shut down');
      const doc = byId.get(id)!;
      const rows = redactionRows.filter((r) => r.document_id === id);
      const rules = rows.filter((r) => r.kind !== 'box').map(ruleOf);
      const boxes: Box[] = rows
        .filter((r) => r.kind === 'box')
        .map((r) => ({ page: r.page!, x: r.x!, y: r.y!, width: r.width!, height: r.height! }));
      const docCodes = codes.get(id) ?? [];
      const legend =
        legendCodes.find((l) => docCodes.includes(l.codeId))?.legend ?? production.legend;
      const originalPath = ctx.blobs.pathOf(doc.sha256);
      const p = plan(
        doc,
        originOf.get(id) ?? 'source',
        rules,
        boxes,
        privileged.has(id),
        production.privileged,
        production.natives,
        originalPath,
      );
      const result = await pool.render({
        ...p.task,
        stamp: {
          prefix: production.bates_prefix,
          padding: production.bates_padding,
          startSeq: seq,
          legend,
        },
        tmpDir,
      });
      if (result.fallback)
        ctx.logger.warn(
          { productionId, document: doc.control_number, reason: result.fallback },
          'production page fallback: laid out from text',
        );
      const first = batesNumber(production.bates_prefix, production.bates_padding, seq);
      add(`PDF/${first}.pdf`, Buffer.from(result.pdf), false);
      const textName = `TEXT/${first}.txt`;
      add(textName, Buffer.from(p.text, 'utf8'), true);
      let nativeName = '';
      if (p.native) {
        nativeName = `NATIVES/${first}${extensionOf(doc.original_name)}`;
        zip.addFile(originalPath, nativeName, { mtime, compress: true });
        manifest.push({
          path: nativeName,
          sha256: doc.sha256,
          size: (await stat(originalPath)).size,
        });
      }
      placed.push({
        doc,
        begin: seq,
        end: seq + result.pages - 1,
        treatment: p.treatment,
        legend,
        nativeName,
        textName,
        redacted: p.treatment === 'redacted',
      });
      seq += result.pages;
      await run.progress({
        progress: position + 1,
        total: order.length,
        message: `Rendered ${position + 1} of ${order.length} documents`,
      });
    }

    const fmt = (n: number) => batesNumber(production.bates_prefix, production.bates_padding, n);
    const familyRange = new Map<number, { begin: number; end: number }>();
    for (const p of placed) {
      const key = p.doc.family_id ?? p.doc.id;
      const range = familyRange.get(key);
      familyRange.set(key, {
        begin: Math.min(range?.begin ?? p.begin, p.begin),
        end: Math.max(range?.end ?? p.end, p.end),
      });
    }
    const csvRows = placed.map((p) => {
      const fam = familyRange.get(p.doc.family_id ?? p.doc.id)!;
      const withheld = p.treatment === 'withheld';
      return [
        fmt(p.begin),
        fmt(p.end),
        fmt(fam.begin),
        fmt(fam.end),
        p.doc.custodian ?? '',
        (custodians.get(p.doc.id) ?? []).join('; '),
        withheld ? '' : p.doc.email_from || (p.doc.mime === 'message/rfc822' ? p.doc.author : ''),
        withheld ? '' : p.doc.email_to || p.doc.recipients,
        withheld ? '' : p.doc.email_cc,
        withheld ? '' : p.doc.email_bcc,
        withheld ? '' : p.doc.title || p.doc.text_title || '',
        withheld ? '' : (p.doc.sent_at ?? '').slice(0, 10),
        withheld ? '' : p.doc.original_name,
        p.doc.sha256,
        p.end - p.begin + 1,
        p.legend,
        p.redacted ? 'yes' : 'no',
        p.treatment,
        p.nativeName,
        p.textName,
      ] as (string | number)[];
    });
    add(
      'DATA/metadata.csv',
      Buffer.from(toCsv(PRODUCTION_METADATA_COLUMNS, csvRows), 'utf8'),
      true,
    );
    const manifestBody = {
      production: production.name,
      matterId,
      bates: { first: fmt(production.bates_start), last: fmt(seq - 1) },
      createdAt: mtime.toISOString(),
      algorithm: 'SHA-256',
      files: manifest,
    };
    zip.addBuffer(Buffer.from(JSON.stringify(manifestBody, null, 2) + '\n'), 'manifest.json', {
      mtime,
    });
    zip.end();
    await written;
    await rename(partial, zipPath);
    const zipHash = sha256(await readFile(zipPath));
    const zipSize = (await stat(zipPath)).size;
    await ctx.db.transaction().execute(async (trx) => {
      for (const [position, p] of placed.entries())
        await trx
          .updateTable('production_documents')
          .set({
            position: position + 1,
            treatment: p.treatment,
            begin_seq: p.begin,
            end_seq: p.end,
            pages: p.end - p.begin + 1,
            legend: p.legend,
          })
          .where('production_id', '=', productionId)
          .where('document_id', '=', p.doc.id)
          .execute();
      const produced = placed.filter((p) => p.treatment === 'redacted').map((p) => p.doc.id);
      if (produced.length > 0)
        await trx
          .updateTable('redactions')
          .set({ produced_in: productionId })
          .where('document_id', 'in', produced)
          .where('removed_at', 'is', null)
          .where('produced_in', 'is', null)
          .execute();
      await trx
        .updateTable('productions')
        .set({
          state: 'built',
          first_seq: production.bates_start,
          last_seq: seq - 1,
          pages: seq - production.bates_start,
          zip_sha256: zipHash,
          zip_size: zipSize,
          built_at: new Date().toISOString(),
          error: null,
        })
        .where('id', '=', productionId)
        .execute();
      await recordAudit(trx, {
        actorId: run.job.created_by,
        matterId,
        action: 'production.built',
        targetType: 'production',
        targetId: productionId,
        detail: {
          name: production.name,
          documents: placed.length,
          pages: seq - production.bates_start,
          first: fmt(production.bates_start),
          last: fmt(seq - 1),
          sha256: zipHash,
        },
      });
    });
    return `Built ${placed.length} documents, ${fmt(production.bates_start)} to ${fmt(seq - 1)}`;
  } catch (error) {
    (zip.outputStream as Readable).destroy();
    await written.catch(() => undefined);
    await rm(partial, { force: true });
    await markFailed(ctx, matterId, productionId, (error as Error).message, run.job.created_by);
    throw error;
  } finally {
    await rm(tmpDir, { recursive: true, force: true });
  }
}

async function markFailed(
  ctx: AppContext,
  matterId: number,
  productionId: number,
  message: string,
  actorId: string | null,
) {
  await ctx.db
    .updateTable('productions')
    .set({ state: 'failed', error: message })
    .where('id', '=', productionId)
    .execute();
  await recordAudit(ctx.db, {
    actorId,
    matterId,
    action: 'production.build_failed',
    targetType: 'production',
    targetId: productionId,
    detail: { error: message },
  });
}

/** build-production: renders, numbers and packages a production set; see the file comment. */
export function buildProductionHandler(ctx: AppContext): JobHandler<BuildProductionPayload> {
  const pool = new RenderPool();
  return {
    run: (run) => build(ctx, pool, run),
    async requeue(job, payload) {
      // A half-written zip is never kept; the production goes back to be built again.
      if (job.matter_id !== null)
        await markFailed(
          ctx,
          job.matter_id,
          payload.productionId,
          'interrupted by a restart; build it again',
          job.created_by,
        );
    },
  };
}
