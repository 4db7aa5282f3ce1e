// `npm run bench:collections`: extraction throughput per format through the extraction
// worker pool (the path uploads take), OCR pages per minute (pdftoppm + tesseract in the
// worker), container expansion (MBOX split, the Enron PST), and near-duplicate grouping
// (MinHash signatures + LSH banding) of 100,000 synthetic documents. Writes
// scripts/bench/collections.json and its section of docs/PERFORMANCE.md.
// `-- --quick`: fewer files and 20,000 documents, printed only.
import { execFileSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import os from 'node:os';
import path from 'node:path';
import ExcelJS from 'exceljs';
import PDFDocument from 'pdfkit';
import yazl from 'yazl';
import { makeDocx, makeEml, makeHtml, makePdf, makeText } from '../../corpus-demo/render';
import { expandContainer } from '../../server/extraction/containers';
import { ExtractionPool } from '../../server/extraction/extract';
import { ARCHIVE_DEFAULTS } from '../../server/extraction/types';
import {
  groupNearDuplicates,
  shingles,
  signature,
  type SignedDocument,
} from '../../server/relationships/minhash';

const quick = process.argv.includes('--quick');
const FILES = quick ? 10 : 40;
const OCR_PAGES = quick ? 2 : 6;
const NEAR_DUP_DOCS = quick ? 20_000 : 100_000;

const dir = mkdtempSync(path.join(os.tmpdir(), 'quarry-bench-collections-'));
let serial = 0;
const save = (bytes: Buffer, ext: string) => {
  serial += 1;
  const file = path.join(dir, `f${serial}${ext}`);
  writeFileSync(file, bytes);
  return file;
};

// Deterministic filler text (mulberry32).
function rng(seed: number) {
  return () => {
    seed = (seed + 0x6d2b79f5) | 0;
    let t = Math.imul(seed ^ (seed >>> 15), 1 | seed);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
const random = rng(2026);
const VOCAB = Array.from({ length: 20_000 }, (_, i) => `w${i.toString(36)}`);
const prose = (n: number) =>
  Array.from({ length: n }, () => VOCAB[Math.floor(random() * random() * VOCAB.length)]).join(' ');

async function xlsx(): Promise<Buffer> {
  const wb = new ExcelJS.Workbook();
  for (let s = 0; s < 3; s += 1) {
    const sheet = wb.addWorksheet(`Sheet ${s + 1}`);
    for (let r = 0; r < 200; r += 1) sheet.addRow([prose(3), r, random() * 1000, prose(5)]);
  }
  return Buffer.from(await wb.xlsx.writeBuffer());
}

async function pptx(): Promise<Buffer> {
  const ns =
    'xmlns:a="http://schemas.openxmlformats.org/drawingml/2006/main" xmlns:p="http://schemas.openxmlformats.org/presentationml/2006/main"';
  const zip = new yazl.ZipFile();
  zip.addBuffer(Buffer.from('<Types/>'), '[Content_Types].xml');
  zip.addBuffer(Buffer.from(`<p:presentation ${ns}/>`), 'ppt/presentation.xml');
  for (let i = 1; i <= 20; i += 1)
    zip.addBuffer(
      Buffer.from(
        `<p:sld ${ns}><a:p><a:r><a:t>${prose(40)}</a:t></a:r></a:p><a:p><a:r><a:t>${prose(40)}</a:t></a:r></a:p></p:sld>`,
      ),
      `ppt/slides/slide${i}.xml`,
    );
  zip.end();
  const chunks: Buffer[] = [];
  for await (const c of zip.outputStream) chunks.push(c as Buffer);
  return Buffer.concat(chunks);
}

async function scanPdf(): Promise<Buffer> {
  // A page of typed text rendered to an image (pdfkit -> pdftoppm), wrapped in a PDF with no text layer.
  const doc = new PDFDocument({ size: 'A4', margin: 72 });
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const done = new Promise((r) => doc.on('end', r));
  doc
    .font('Helvetica')
    .fontSize(11)
    .text(
      Array.from(
        { length: 30 },
        () =>
          'The parties agree that deliveries of flour shall be made weekly and inspected on arrival.',
      ).join(' '),
    );
  doc.end();
  await done;
  const text = save(Buffer.concat(chunks), '.pdf');
  const prefix = path.join(dir, `scan${serial}`);
  execFileSync('pdftoppm', ['-r', '300', '-gray', '-png', '-singlefile', text, prefix]);
  const image = new PDFDocument({ size: 'A4', margin: 0 });
  const out: Buffer[] = [];
  image.on('data', (c: Buffer) => out.push(c));
  const ended = new Promise((r) => image.on('end', r));
  image.image(readFileSync(`${prefix}.png`), 0, 0, { width: image.page.width });
  image.end();
  await ended;
  return Buffer.concat(out);
}

interface FormatRow {
  format: string;
  files: number;
  seconds: number;
  filesPerSecond: number;
  failed: number;
}

async function timeFormat(
  pool: ExtractionPool,
  format: string,
  ext: string,
  make: (i: number) => Promise<Buffer> | Buffer,
  count = FILES,
): Promise<FormatRow> {
  const files: string[] = [];
  for (let i = 0; i < count; i += 1) files.push(save(await make(i), ext));
  const start = performance.now();
  let failed = 0;
  // One file at a time, like the extraction job (the pool has one worker by default).
  for (const file of files) {
    const result = await pool.extract(file, path.basename(file));
    if (!result.ok) failed += 1;
  }
  const seconds = (performance.now() - start) / 1000;
  const row = { format, files: count, seconds, filesPerSecond: count / seconds, failed };
  console.log(JSON.stringify(row));
  return row;
}

async function main() {
  const started = performance.now();
  // The pool's workers are unref'd (a server's listener keeps the process up); keep it up here.
  const keepAlive = setInterval(() => undefined, 60_000);
  const pool = new ExtractionPool();
  await pool.warm();
  const formats: FormatRow[] = [];
  formats.push(await timeFormat(pool, 'text', '.txt', () => makeText(prose(800))));
  formats.push(
    await timeFormat(pool, 'html', '.html', () =>
      makeHtml({ title: prose(4), bodyParagraphs: [prose(300), prose(300)] }),
    ),
  );
  formats.push(
    await timeFormat(pool, 'email', '.eml', (i) =>
      makeEml({
        from: 'A <a@example.com>',
        to: ['b@example.com'],
        subject: prose(5),
        date: new Date(Date.UTC(2022, 0, 1 + i)),
        text: prose(400),
      }),
    ),
  );
  formats.push(
    await timeFormat(pool, 'pdf (text layer, 3 pages)', '.pdf', () =>
      makePdf({ title: prose(3), author: 'A', pages: [prose(300), prose(300), prose(300)] }),
    ),
  );
  formats.push(
    await timeFormat(pool, 'docx', '.docx', () =>
      makeDocx({ title: prose(3), author: 'A', paragraphs: [prose(300), prose(300)] }),
    ),
  );
  formats.push(await timeFormat(pool, 'xlsx (3 sheets x 200 rows)', '.xlsx', () => xlsx()));
  formats.push(
    await timeFormat(pool, 'csv (500 rows)', '.csv', () =>
      Buffer.from(Array.from({ length: 500 }, () => `${prose(2)},${prose(6)},42`).join('\n')),
    ),
  );
  formats.push(await timeFormat(pool, 'pptx (20 slides)', '.pptx', () => pptx()));

  // OCR: one scanned page per file, through the worker.
  const ocr = await timeFormat(
    pool,
    'pdf (scanned, OCR, 1 page)',
    '.pdf',
    () => scanPdf(),
    OCR_PAGES,
  );
  formats.push(ocr);
  const ocrPagesPerMinute = (ocr.files / ocr.seconds) * 60;
  await pool.close();

  // Containers: MBOX split (messages per second) and the Enron PST (pst-extractor's sample).
  const mboxMessages = quick ? 500 : 5_000;
  const mbox = Array.from(
    { length: mboxMessages },
    (_, i) =>
      `From s${i}@example.com Thu Jan  6 10:00:00 2022\nFrom: s${i}@example.com\nSubject: ${prose(4)}\nDate: Thu, 06 Jan 2022 10:00:00 +0000\n\n${prose(200)}\n>From an escaped line\n`,
  ).join('\n');
  const mboxFile = save(Buffer.from(mbox), '.mbox');
  let t = performance.now();
  const split = await expandContainer('mbox', mboxFile, path.join(dir, 'mbox'), ARCHIVE_DEFAULTS);
  const mboxSeconds = (performance.now() - t) / 1000;
  if (!split.ok || split.files.length !== mboxMessages) throw new Error('mbox split failed');
  const require = createRequire(import.meta.url);
  const pst = path.join(
    path.dirname(require.resolve('pst-extractor/package.json')),
    'example/testdata/enron.pst',
  );
  t = performance.now();
  const pstOut = await expandContainer('pst', pst, path.join(dir, 'pst'), ARCHIVE_DEFAULTS);
  const pstSeconds = (performance.now() - t) / 1000;
  if (!pstOut.ok) throw new Error('pst expansion failed');

  // Near-duplicates: documents of 150 to 450 words; every 10th base gets 3 near copies.
  const docs: { id: number; text: string }[] = [];
  let id = 1;
  while (docs.length < NEAR_DUP_DOCS) {
    const base = prose(150 + Math.floor(random() * 300));
    docs.push({ id: id++, text: base });
    if (id % 10 === 0) {
      for (let c = 0; c < 3 && docs.length < NEAR_DUP_DOCS; c += 1) {
        const words = base.split(' ');
        words[Math.floor(random() * words.length)] = `edit${id}`;
        docs.push({ id: id++, text: words.join(' ') });
      }
    }
  }
  t = performance.now();
  const signed: SignedDocument[] = docs.map((d) => ({
    id: d.id,
    signature: signature(shingles(d.text)),
    length: d.text.length,
  }));
  const signatureSeconds = (performance.now() - t) / 1000;
  t = performance.now();
  const members = groupNearDuplicates(signed, 0.8);
  const groupingSeconds = (performance.now() - t) / 1000;
  const groups = new Set(members.map((m) => m.groupId)).size;

  const report = {
    generatedAt: new Date().toISOString(),
    machine: {
      cpus: os.cpus().length,
      cpuModel: os.cpus()[0]?.model,
      node: process.version,
      loadAverage: os.loadavg().map((x) => Number(x.toFixed(2))),
    },
    quick,
    formats,
    ocrPagesPerMinute,
    mbox: { messages: mboxMessages, seconds: mboxSeconds, perSecond: mboxMessages / mboxSeconds },
    pst: {
      messages: pstOut.files.length,
      seconds: pstSeconds,
      perSecond: pstOut.files.length / pstSeconds,
    },
    nearDuplicates: {
      documents: docs.length,
      signatureSeconds,
      groupingSeconds,
      totalSeconds: signatureSeconds + groupingSeconds,
      groups,
      grouped: members.length,
    },
    totalSeconds: (performance.now() - started) / 1000,
  };
  console.log(JSON.stringify(report, null, 2));
  rmSync(dir, { recursive: true, force: true });
  clearInterval(keepAlive);
  if (quick) return;
  writeFileSync('scripts/bench/collections.json', `${JSON.stringify(report, null, 2)}\n`);
  const f = (x: number, d = 1) => x.toFixed(d);
  const nd = report.nearDuplicates;
  const section = [
    '## Collections: extraction, OCR, containers and near-duplicates',
    '',
    `Generated by \`npm run bench:collections\` at ${report.generatedAt} on ${report.machine.cpus} cores (${String(report.machine.cpuModel)}), Node ${report.machine.node}, load average at the end ${JSON.stringify(report.machine.loadAverage)} (the machine is shared: figures are lower bounds of an idle machine's). Extraction runs one file at a time through the extraction worker pool (one worker), as the extraction job does; generated files, so sizes are typical rather than real.`,
    '',
    '| format | files | seconds | files/s | failed |',
    '|---|---:|---:|---:|---:|',
    ...formats.map(
      (r) =>
        `| ${r.format} | ${r.files} | ${f(r.seconds, 2)} | ${f(r.filesPerSecond, 1)} | ${r.failed} |`,
    ),
    '',
    `- OCR: ${f(ocrPagesPerMinute, 1)} pages per minute (300 dpi greyscale, pdftoppm + tesseract eng, one page at a time).`,
    `- MBOX split: ${report.mbox.messages} messages in ${f(report.mbox.seconds, 2)} s (${f(report.mbox.perSecond, 0)} messages/s).`,
    `- PST (pst-extractor's Enron sample, rebuilt as RFC 5322 messages): ${report.pst.messages} messages in ${f(report.pst.seconds, 2)} s (${f(report.pst.perSecond, 0)} messages/s).`,
    `- Near-duplicates of ${nd.documents.toLocaleString('en-US')} documents (150-450 words, 128 hashes, 32 bands of 4): MinHash signatures ${f(nd.signatureSeconds)} s (done once per document at extraction), grouping ${f(nd.groupingSeconds)} s, together ${f(nd.totalSeconds)} s (target under 60 s): ${nd.groups} groups, ${nd.grouped} documents grouped.`,
    '',
  ].join('\n');
  const file = 'docs/PERFORMANCE.md';
  const existing = existsSync(file) ? readFileSync(file, 'utf8') : '# Performance\n';
  const re = /## Collections: extraction, OCR, containers and near-duplicates\n[\s\S]*?(?=\n## |$)/;
  const next = re.test(existing)
    ? existing.replace(re, section)
    : `${existing.trimEnd()}\n\n${section}`;
  writeFileSync(file, next.endsWith('\n') ? next : `${next}\n`);
}

await main();
