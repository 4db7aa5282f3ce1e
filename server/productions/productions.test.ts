// Productions over HTTP against a real app: Bates numbering (page-level, contiguous, in
// family order, continued by the next production), endorsement of every page, burned-in
// redactions, slip sheets, the family check, and the zip's metadata file and manifest.
// Produced PDFs are read back with pdf-lib (page counts) and pdf.js, and with poppler's
// pdftotext where it is installed (.ci/run installs poppler-utils), as the other side would.
import { execFileSync, spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { parse } from 'csv-parse/sync';
import { PDFDocument } from 'pdf-lib';
import yauzl from 'yauzl';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeEml, makePdf, makeText } from '../../corpus-demo/render';
import type { UploadBatchResponse } from '../../shared/schemas/documents';
import type { JobResponse } from '../../shared/schemas/jobs';
import type { Production, ProductionResponse } from '../../shared/schemas/productions';
import {
  createTestApp,
  type Agent,
  type TestApp,
  type TestMatter,
  bytesBody,
} from '../../tests/helpers';
import { familyOrder, WITHHELD_FAMILY, WITHHELD_PRIVILEGED } from './build';

let t: TestApp;
let matter: TestMatter;
let lead: Agent;
let reviewer: Agent;
const ids: Record<string, number> = {};
const hasPdftotext = spawnSync('pdftotext', ['-v']).status === 0;

const ACCOUNT = '4412-7781-0093';
const SECRET_SPAN = 'the settlement figure of 2.4 million';

async function waitForJob(agent: Agent, jobId: number, timeoutMs = 120_000) {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const job = ((await agent.get(`/api/jobs/${jobId}`)).body as JobResponse).job;
    if (job.status === 'succeeded' || job.status === 'failed') return job;
    if (Date.now() > deadline) throw new Error(`job ${jobId} still ${job.status}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

async function code(docId: number, name: string) {
  const c = await t.ctx.db
    .selectFrom('codes')
    .select('id')
    .where('matter_id', '=', matter.id)
    .where('name', '=', name)
    .executeTakeFirstOrThrow();
  await t.ctx.db
    .insertInto('document_codes')
    .values({ document_id: docId, code_id: c.id, coded_by: matter.lead.id, coded_at: 'now' })
    .execute();
}

/** Every entry of a zip, as buffers. */
function unzip(buffer: Buffer): Promise<Map<string, Buffer>> {
  return new Promise((resolve, reject) => {
    yauzl.fromBuffer(buffer, { lazyEntries: true }, (error, zip) => {
      if (error) return reject(error);
      const files = new Map<string, Buffer>();
      zip.on('entry', (entry: yauzl.Entry) => {
        zip.openReadStream(entry, (err, stream) => {
          if (err) return reject(err);
          const chunks: Buffer[] = [];
          stream.on('data', (c: Buffer) => chunks.push(c));
          stream.on('end', () => {
            files.set(entry.fileName, Buffer.concat(chunks));
            zip.readEntry();
          });
        });
      });
      zip.on('end', () => resolve(files));
      zip.readEntry();
    });
  });
}

/** The text of each page, through pdf.js (the library the viewer uses). */
async function pageTexts(pdf: Buffer): Promise<string[]> {
  const pdfjs = await import('pdfjs-dist/legacy/build/pdf.mjs');
  const doc = await pdfjs.getDocument({ data: new Uint8Array(pdf), verbosity: 0 }).promise;
  const out: string[] = [];
  for (let n = 1; n <= doc.numPages; n++) {
    const content = await (await doc.getPage(n)).getTextContent();
    out.push(content.items.map((i) => ('str' in i ? i.str : '')).join(' '));
  }
  await doc.destroy();
  return out;
}

function pdftotext(pdf: Buffer): string {
  const dir = mkdtempSync(path.join(tmpdir(), 'quarry-prod-'));
  const file = path.join(dir, 'p.pdf');
  writeFileSync(file, pdf);
  return execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' });
}

async function build(productionId: number): Promise<Production> {
  const res = await lead.post(`/api/matters/${matter.id}/productions/${productionId}/build`);
  expect(res.status, JSON.stringify(res.body)).toBe(202);
  const job = await waitForJob(lead, res.body.job.id);
  expect(job.status, job.error ?? '').toBe('succeeded');
  return (
    (await lead.get(`/api/matters/${matter.id}/productions/${productionId}`))
      .body as ProductionResponse
  ).production;
}

async function download(productionId: number) {
  const res = await lead
    .get(`/api/matters/${matter.id}/productions/${productionId}/download`)
    .buffer(true)
    .parse(bytesBody);
  expect(res.status).toBe(200);
  expect(res.headers['content-type']).toMatch(/application\/zip/);
  return res.body as Buffer;
}

beforeAll(async () => {
  t = await createTestApp();
  matter = await t.buildMatter({ controlPrefix: 'PRD' });
  lead = await t.agentFor(matter.lead);
  const r = await t.buildUser();
  await t.addMember(matter, r, 'reviewer');
  reviewer = await t.agentFor(r);
  const files = [
    {
      name: 'supply-note.eml',
      content: await makeEml({
        from: 'Iona Marsh <iona@fernhill.example>',
        to: ['Dev Patel <dev@corrow.example>'],
        cc: ['Ruth Ames <ruth@corrow.example>'],
        subject: 'Revised supply schedule',
        date: new Date('2022-05-10T09:30:00Z'),
        text: 'Please find the revised supply schedule attached.',
        attachments: [
          {
            filename: 'schedule.txt',
            contentType: 'text/plain',
            content: makeText('Week 1: 40 tonnes. Week 2: 55 tonnes. Week 3: 38 tonnes.'),
          },
        ],
      }),
    },
    {
      name: 'board-minutes.pdf',
      content: await makePdf({
        title: 'Board minutes',
        author: 'Iona Marsh',
        pages: [
          `The board noted the supplier account ${ACCOUNT} and the late deliveries.`,
          'The board asked for a report on the quality complaints by the next meeting.',
        ],
      }),
    },
    {
      name: 'counsel-memo.txt',
      content: makeText(
        `Counsel advised that ${SECRET_SPAN} should not be disclosed. The delivery dispute continues.`,
      ),
    },
    {
      name: 'advice.txt',
      content: makeText('Privileged legal advice on the supply contract claims.'),
    },
    { name: 'later.txt', content: makeText('A later delivery note for the second production.') },
  ];
  let req = lead.post(`/api/matters/${matter.id}/documents`).field('custodian', 'Iona Marsh');
  for (const f of files) req = req.attach('files', f.content, f.name);
  const res = await req;
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  const batch = res.body as UploadBatchResponse;
  expect((await waitForJob(lead, batch.jobId!)).status).toBe('succeeded');
  await t.ctx.jobs.waitForIdle();
  const docs = await t.ctx.db
    .selectFrom('documents')
    .select(['id', 'original_name'])
    .where('matter_id', '=', matter.id)
    .execute();
  for (const d of docs) ids[d.original_name] = d.id;
  for (const name of ['supply-note.eml', 'board-minutes.pdf', 'counsel-memo.txt', 'advice.txt'])
    await code(ids[name], 'Responsive');
  await code(ids['advice.txt'], 'Privileged');
}, 120_000);

afterAll(async () => {
  await t?.close();
});

describe('redactions', () => {
  it('marks a span, every hit of a format mask and a PDF box; refuses bad ones with a message', async () => {
    const base = `/api/matters/${matter.id}/documents`;
    const memo = (await lead.get(`${base}/${ids['counsel-memo.txt']}/review`)).body;
    const body: string = memo.text.body;
    const start = body.indexOf(SECRET_SPAN);
    expect(start).toBeGreaterThan(0);
    const span = await reviewer
      .post(`${base}/${ids['counsel-memo.txt']}/redactions`)
      .send({ kind: 'span', start, end: start + SECRET_SPAN.length, reason: 'Privilege' });
    expect(span.status, JSON.stringify(span.body)).toBe(201);
    expect(span.body.redaction.text).toBe(SECRET_SPAN);

    const pattern = await reviewer.post(`${base}/${ids['board-minutes.pdf']}/redactions`).send({
      kind: 'pattern',
      pattern: '####-####-####',
      patternKind: 'format',
      reason: 'Personal data',
    });
    expect(pattern.status, JSON.stringify(pattern.body)).toBe(201);
    expect(pattern.body.redaction.hits).toBe(1);
    const box = await reviewer.post(`${base}/${ids['board-minutes.pdf']}/redactions`).send({
      kind: 'box',
      page: 2,
      x: 0.1,
      y: 0.1,
      width: 0.3,
      height: 0.05,
      reason: 'Personal data',
    });
    expect(box.status, JSON.stringify(box.body)).toBe(201);

    const refusals = [
      [{ kind: 'span', start: 5, end: 2, reason: 'x' }, 'end: must be after start'],
      [{ kind: 'span', start: 0, end: 10_000, reason: 'x' }, 'end: must be at most'],
      [{ kind: 'pattern', pattern: 'no such words here', reason: 'x' }, 'pattern: has no hits'],
      [
        { kind: 'box', page: 1, x: 0, y: 0, width: 0.1, height: 0.1, reason: 'x' },
        'needs a PDF page',
      ],
      [{ kind: 'span', start: 0, end: 3 }, 'reason: is required'],
    ] as const;
    for (const [input, message] of refusals) {
      const res = await reviewer.post(`${base}/${ids['counsel-memo.txt']}/redactions`).send(input);
      expect(res.status).toBe(400);
      expect(res.body.error.message).toContain(message);
    }
    const list = await reviewer.get(`${base}/${ids['board-minutes.pdf']}/redactions`);
    expect(list.body.redactions.map((r: { kind: string }) => r.kind)).toEqual(['pattern', 'box']);
    const audit = await t.ctx.db
      .selectFrom('audit_events')
      .select('action')
      .where('matter_id', '=', matter.id)
      .where('action', '=', 'redaction.added')
      .execute();
    expect(audit.length).toBe(3);

    // Issue 15: a redacted document is on the privilege log as redacted, with the reason;
    // the document coded Privileged (advice.txt) stays withheld.
    const log = await lead.get(`/api/matters/${matter.id}/privilege-log`);
    expect(log.status).toBe(200);
    const rowOf = (docId: number) =>
      (log.body.rows as { documentId: number; treatment: string; basis: string }[]).find(
        (r) => r.documentId === docId,
      );
    expect(rowOf(ids['counsel-memo.txt'])).toMatchObject({
      treatment: 'Redacted',
      basis: 'Privilege',
    });
    expect(rowOf(ids['board-minutes.pdf'])).toMatchObject({
      treatment: 'Redacted',
      basis: 'Personal data',
    });
    expect(rowOf(ids['advice.txt'])).toMatchObject({ treatment: 'Withheld' });
    expect(rowOf(ids['supply-note.eml'])).toBeUndefined();
  });
});

describe('a production from codes', () => {
  let production: Production;

  it('lists the family member the set would split and refuses to build until it is resolved', async () => {
    const res = await lead.post(`/api/matters/${matter.id}/productions`).send({
      name: 'First production',
      source: { codes: ['Responsive'] },
      bates: { prefix: 'FERN', start: 1, padding: 6 },
      legend: 'CONFIDENTIAL',
      privileged: 'withhold',
    });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    production = res.body.production;
    expect(production.counts.documents).toBe(4);
    // The attachment of the produced e-mail is not coded Responsive: a planted split family.
    expect(production.familyCheck.gaps).toEqual([
      expect.objectContaining({
        documentId: ids['schedule.txt'],
        relation: 'attachment',
        ofDocumentId: ids['supply-note.eml'],
      }),
    ]);
    const refused = await lead.post(`/api/matters/${matter.id}/productions/${production.id}/build`);
    expect(refused.status).toBe(409);
    expect(refused.body.error.message).toContain('family check found 1 family member');
    const resolved = await lead
      .post(`/api/matters/${matter.id}/productions/${production.id}/family`)
      .send({ add: [ids['schedule.txt']] });
    expect(resolved.status, JSON.stringify(resolved.body)).toBe(200);
    expect(resolved.body.production.familyCheck.resolved).toBe(true);
    expect(resolved.body.production.counts.added).toBe(1);
  });

  it('numbers pages contiguously in family order and stamps every page with its number and legend', async () => {
    production = await build(production.id);
    expect(production.state).toBe('built');
    const files = await unzip(await download(production.id));
    const rows = parse(files.get('DATA/metadata.csv')!.toString('utf8'), {
      columns: true,
      bom: true,
    }) as Record<string, string>[];
    // Family order: the e-mail, then its attachment, then the rest by control number.
    const docs = await t.ctx.db
      .selectFrom('documents')
      .select(['id', 'parent_id', 'family_id', 'control_number', 'sha256', 'original_name'])
      .where('matter_id', '=', matter.id)
      .where('original_name', '!=', 'later.txt')
      .execute();
    const expected = familyOrder(docs).map((id) => docs.find((d) => d.id === id)!);
    expect(rows.map((r) => r['File Name'] || r['SHA-256'])).toEqual(
      expected.map((d) => (d.original_name === 'advice.txt' ? d.sha256 : d.original_name)),
    );
    expect(expected[1].parent_id).toBe(expected[0].id);
    let next = 1;
    for (const row of rows) {
      const begin = Number(row['Begin Bates'].slice(4));
      const end = Number(row['End Bates'].slice(4));
      expect(row['Begin Bates']).toMatch(/^FERN\d{6}$/);
      expect(begin).toBe(next);
      next = end + 1;
      const pdf = files.get(`PDF/${row['Begin Bates']}.pdf`)!;
      const doc = await PDFDocument.load(pdf);
      expect(doc.getPageCount()).toBe(end - begin + 1);
      expect(Number(row['Page Count'])).toBe(end - begin + 1);
      const texts = await pageTexts(pdf);
      texts.forEach((text, i) => {
        expect(text).toContain(`FERN${String(begin + i).padStart(6, '0')}`);
        expect(text).toContain('CONFIDENTIAL');
      });
      if (hasPdftotext) expect(pdftotext(pdf)).toContain(row['Begin Bates']);
    }
    expect(production.batesRange).toEqual({
      first: 'FERN000001',
      last: `FERN${String(next - 1).padStart(6, '0')}`,
    });
    expect(production.counts.pages).toBe(next - 1);
    // The family columns span the e-mail and its attachment.
    expect(rows[0]['Begin Family']).toBe(rows[0]['Begin Bates']);
    expect(rows[0]['End Family']).toBe(rows[1]['End Bates']);
    expect(rows[0]['From']).toContain('iona@fernhill.example');
    expect(rows[0]['To'] + rows[0]['Cc']).toContain('ruth@corrow.example');
  });

  it('burns redactions in: the redacted text is in neither the PDF nor the text file', async () => {
    const files = await unzip(await download(production.id));
    const rows = parse(files.get('DATA/metadata.csv')!.toString('utf8'), {
      columns: true,
      bom: true,
    }) as Record<string, string>[];
    for (const [name, secret] of [
      ['counsel-memo.txt', SECRET_SPAN],
      ['board-minutes.pdf', ACCOUNT],
    ]) {
      const row = rows.find((r) => r['File Name'] === name)!;
      expect(row['Redacted']).toBe('yes');
      const pdf = files.get(`PDF/${row['Begin Bates']}.pdf`)!;
      const text = (await pageTexts(pdf)).join('\n');
      expect(text).not.toContain(secret);
      if (hasPdftotext) expect(pdftotext(pdf)).not.toContain(secret);
      expect(pdf.includes(Buffer.from(secret))).toBe(false);
      const txt = files.get(row['Text File'])!.toString('utf8');
      expect(txt).not.toContain(secret);
      expect(txt).toContain('[REDACTED:');
    }
    // The unredacted rest of the memo is still produced as text.
    const memo = rows.find((r) => r['File Name'] === 'counsel-memo.txt')!;
    expect(files.get(memo['Text File'])!.toString('utf8')).toContain(
      'The delivery dispute continues.',
    );
    // Produced redactions are locked.
    const redactions = (
      await lead.get(`/api/matters/${matter.id}/documents/${ids['counsel-memo.txt']}/redactions`)
    ).body.redactions;
    const removal = await lead.delete(
      `/api/matters/${matter.id}/documents/${ids['counsel-memo.txt']}/redactions/${redactions[0].id}`,
    );
    expect(removal.status).toBe(409);
  });

  it('withholds a privileged document behind a one-page slip sheet, with no native and no text', async () => {
    const files = await unzip(await download(production.id));
    const rows = parse(files.get('DATA/metadata.csv')!.toString('utf8'), {
      columns: true,
      bom: true,
    }) as Record<string, string>[];
    const advice = await t.ctx.db
      .selectFrom('documents')
      .select('sha256')
      .where('id', '=', ids['advice.txt'])
      .executeTakeFirstOrThrow();
    const row = rows.find((r) => r['SHA-256'] === advice.sha256)!;
    expect(row['Treatment']).toBe('withheld');
    expect(row['Begin Bates']).toBe(row['End Bates']);
    expect(row['Native File']).toBe('');
    expect(row['Subject']).toBe('');
    const text = (await pageTexts(files.get(`PDF/${row['Begin Bates']}.pdf`)!)).join(' ');
    expect(text).toContain(WITHHELD_PRIVILEGED);
    expect(text).not.toContain('legal advice');
    expect(files.get(row['Text File'])!.toString('utf8').trim()).toBe(WITHHELD_PRIVILEGED);
  });

  it('writes a manifest whose SHA-256 of every file agrees with the zip', async () => {
    const zip = await download(production.id);
    expect(createHash('sha256').update(zip).digest('hex')).toBe(production.zip!.sha256);
    const files = await unzip(zip);
    const manifest = JSON.parse(files.get('manifest.json')!.toString('utf8')) as {
      files: { path: string; sha256: string; size: number }[];
    };
    const listed = manifest.files.map((f) => f.path).sort();
    expect(listed).toEqual([...files.keys()].filter((k) => k !== 'manifest.json').sort());
    for (const f of manifest.files) {
      const data = files.get(f.path)!;
      expect(createHash('sha256').update(data).digest('hex'), f.path).toBe(f.sha256);
      expect(data.length).toBe(f.size);
    }
  });

  it('is locked once built, and the next production continues the numbering', async () => {
    const again = await lead.post(`/api/matters/${matter.id}/productions/${production.id}/build`);
    expect(again.status).toBe(409);
    expect(again.body.error.message).toContain('locked');
    await code(ids['later.txt'], 'Hot');
    const clash = await lead.post(`/api/matters/${matter.id}/productions`).send({
      name: 'Second production',
      source: { codes: ['Hot'] },
      bates: { prefix: 'FERN', start: 3, padding: 6 },
      privileged: 'withhold',
    });
    expect(clash.status).toBe(400);
    expect(clash.body.error.message).toContain(`after ${production.batesRange!.last}`);
    const second = await lead.post(`/api/matters/${matter.id}/productions`).send({
      name: 'Second production',
      source: { codes: ['Hot'] },
      bates: { prefix: 'FERN', padding: 6 },
      privileged: 'withhold',
    });
    expect(second.status, JSON.stringify(second.body)).toBe(201);
    const built = await build(second.body.production.id);
    const last = Number(production.batesRange!.last.slice(4));
    expect(built.batesRange!.first).toBe(`FERN${String(last + 1).padStart(6, '0')}`);
  });

  it('slip-sheets a family member the user chose not to produce', async () => {
    const res = await lead.post(`/api/matters/${matter.id}/productions`).send({
      name: 'Attachment only',
      source: { codes: ['Responsive'], excludeCodes: ['Privileged'] },
      bates: { prefix: 'SLIP', padding: 4 },
      privileged: 'withhold',
    });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const p = res.body.production as Production;
    const gap = p.familyCheck.gaps.map((g) => g.documentId);
    const resolved = await lead
      .post(`/api/matters/${matter.id}/productions/${p.id}/family`)
      .send({ slipSheet: gap });
    expect(resolved.status, JSON.stringify(resolved.body)).toBe(200);
    await build(p.id);
    const files = await unzip(await download(p.id));
    const rows = parse(files.get('DATA/metadata.csv')!.toString('utf8'), {
      columns: true,
      bom: true,
    }) as Record<string, string>[];
    const slip = rows.find((r) => r['Treatment'] === 'withheld')!;
    expect((await pageTexts(files.get(`PDF/${slip['Begin Bates']}.pdf`)!)).join(' ')).toContain(
      WITHHELD_FAMILY,
    );
  });

  it('keeps productions to leads and attorneys, and refuses a source that selects nothing', async () => {
    const denied = await reviewer.get(`/api/matters/${matter.id}/productions`);
    expect(denied.status).toBe(403);
    const empty = await lead.post(`/api/matters/${matter.id}/productions`).send({
      name: 'Nothing',
      source: { codes: ['Needs second look'] },
      bates: { prefix: 'NONE' },
      privileged: 'withhold',
    });
    expect(empty.status).toBe(400);
    expect(empty.body.error.message).toContain('selects no documents');
    const unknown = await lead.post(`/api/matters/${matter.id}/productions`).send({
      name: 'Unknown code',
      source: { codes: ['No such code'] },
      bates: { prefix: 'NONE' },
      privileged: 'withhold',
    });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.message).toContain('no code "No such code"');
  });
});
