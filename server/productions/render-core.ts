// Turns one document into produced PDF pages, stamped with their Bates numbers and the
// legend. Runs in a worker thread (render-worker.mjs) so a long document never holds up
// the API. Three ways to a page:
// - a PDF without redactions keeps its own pages (copied with pdf-lib);
// - a PDF with redactions is rasterised (poppler's pdftoppm), the redacted areas are
//   painted black in the pixels themselves and the page becomes an image, so no text
//   layer survives to be extracted; a redacted string that cannot be found on the pages
//   makes the whole document fall back to pages laid out from its redacted text;
// - everything else is laid out from its (already redacted) text, headers first.
// Slip sheets and native placeholders are one laid-out page.
import { execFile } from 'node:child_process';
import { mkdtemp, readdir, readFile, rm } from 'node:fs/promises';
import { createRequire } from 'node:module';
import path from 'node:path';
import { promisify } from 'node:util';
import { crc32, deflateSync } from 'node:zlib';
import fontkit from '@pdf-lib/fontkit';
import { PDFDocument, rgb, type PDFFont, type PDFPage } from 'pdf-lib';

const run = promisify(execFile);
const require = createRequire(import.meta.url);

export interface Box {
  page: number;
  x: number;
  y: number;
  width: number;
  height: number;
}

export interface RenderTask {
  kind: 'pdf' | 'text' | 'placeholder' | 'slip';
  /** The original file (kind 'pdf'). */
  originalPath: string | null;
  title: string;
  /** Header lines drawn above the text (e-mail From/To/Cc/Date/Subject), already redacted. */
  header: { label: string; value: string }[];
  /** Body text for laid-out pages, already redacted. */
  body: string;
  /** kind 'pdf' with redactions: strings to find and paint over, and boxes. */
  redactStrings: string[];
  boxes: Box[];
  /** The sentence on a slip sheet or native placeholder page. */
  notice: string;
  stamp: { prefix: string; padding: number; startSeq: number; legend: string };
  /** Folder for pdftoppm's page images (removed afterwards). */
  tmpDir: string;
}

export interface RenderResult {
  pdf: Uint8Array;
  pages: number;
  /** Why the planned way was not taken (for the build's log), if it was not. */
  fallback: string | null;
}

export const batesNumber = (prefix: string, padding: number, seq: number) =>
  `${prefix}${String(seq).padStart(padding, '0')}`;

const PAGE = { width: 612, height: 792 }; // US Letter, points
const MARGIN = 54;
const FOOTER = 36; // kept clear for the Bates number and legend
const BODY_SIZE = 10;
const LINE = 13;
const RASTER_DPI = 110;

let fontBytes: { regular: Buffer; bold: Buffer } | null = null;
async function fonts() {
  fontBytes ??= {
    regular: await readFile(require.resolve('dejavu-fonts-ttf/ttf/DejaVuSans.ttf')),
    bold: await readFile(require.resolve('dejavu-fonts-ttf/ttf/DejaVuSans-Bold.ttf')),
  };
  return fontBytes;
}

interface Fonts {
  regular: PDFFont;
  bold: PDFFont;
}

async function embedFonts(doc: PDFDocument): Promise<Fonts> {
  doc.registerFontkit(fontkit);
  const bytes = await fonts();
  return {
    regular: await doc.embedFont(bytes.regular, { subset: true }),
    bold: await doc.embedFont(bytes.bold, { subset: true }),
  };
}

/** Characters the font cannot draw become '?' on the page (the text file keeps them). */
function drawable(font: PDFFont, text: string): string {
  const supported = new Set(font.getCharacterSet());
  let out = '';
  for (const ch of text.replace(/\t/g, '    ')) {
    const cp = ch.codePointAt(0)!;
    out += cp < 32 ? ' ' : supported.has(cp) ? ch : '?';
  }
  return out;
}

/** Greedy line breaking by measured width; words longer than a line are split. */
function wrap(font: PDFFont, size: number, text: string, width: number): string[] {
  const lines: string[] = [];
  for (const paragraph of text.split(/\r?\n/)) {
    let line = '';
    for (const word of paragraph.split(/(\s+)/)) {
      if (word === '') continue;
      const candidate = line + word;
      if (font.widthOfTextAtSize(candidate, size) <= width) {
        line = candidate;
        continue;
      }
      if (line.trim() !== '') lines.push(line.trimEnd());
      line = /^\s+$/.test(word) ? '' : word;
      while (font.widthOfTextAtSize(line, size) > width) {
        let cut = line.length - 1;
        while (cut > 1 && font.widthOfTextAtSize(line.slice(0, cut), size) > width) cut -= 1;
        lines.push(line.slice(0, cut));
        line = line.slice(cut);
      }
    }
    lines.push(line.trimEnd());
  }
  return lines;
}

/** Lays out a title, a header block and a body over as many pages as they need. */
function layout(doc: PDFDocument, f: Fonts, task: Pick<RenderTask, 'title' | 'header' | 'body'>) {
  const width = PAGE.width - 2 * MARGIN;
  let page: PDFPage = doc.addPage([PAGE.width, PAGE.height]);
  let y = PAGE.height - MARGIN;
  const newPage = () => {
    page = doc.addPage([PAGE.width, PAGE.height]);
    y = PAGE.height - MARGIN;
  };
  const ensure = () => {
    if (y < MARGIN + FOOTER) newPage();
  };
  if (task.title) {
    for (const line of wrap(f.bold, 12, drawable(f.bold, task.title), width)) {
      ensure();
      page.drawText(line, { x: MARGIN, y, size: 12, font: f.bold });
      y -= 16;
    }
    y -= 4;
  }
  for (const { label, value } of task.header) {
    const labelText = `${label}: `;
    const labelWidth = f.bold.widthOfTextAtSize(labelText, BODY_SIZE);
    const lines = wrap(f.regular, BODY_SIZE, drawable(f.regular, value), width - labelWidth);
    lines.forEach((line, i) => {
      ensure();
      if (i === 0) page.drawText(labelText, { x: MARGIN, y, size: BODY_SIZE, font: f.bold });
      page.drawText(line, { x: MARGIN + labelWidth, y, size: BODY_SIZE, font: f.regular });
      y -= LINE;
    });
  }
  if (task.header.length > 0) {
    ensure();
    page.drawLine({
      start: { x: MARGIN, y: y + 4 },
      end: { x: PAGE.width - MARGIN, y: y + 4 },
      thickness: 0.5,
      color: rgb(0.5, 0.5, 0.5),
    });
    y -= LINE;
  }
  for (const line of wrap(f.regular, BODY_SIZE, drawable(f.regular, task.body), width)) {
    ensure();
    if (line !== '') page.drawText(line, { x: MARGIN, y, size: BODY_SIZE, font: f.regular });
    y -= LINE;
  }
}

/** One page with a notice in the middle (slip sheet or native placeholder). */
function noticePage(doc: PDFDocument, f: Fonts, title: string, notice: string) {
  const page = doc.addPage([PAGE.width, PAGE.height]);
  const width = PAGE.width - 2 * MARGIN;
  let y = PAGE.height / 2 + 40;
  for (const line of wrap(f.bold, 14, drawable(f.bold, notice), width)) {
    const w = f.bold.widthOfTextAtSize(line, 14);
    page.drawText(line, { x: (PAGE.width - w) / 2, y, size: 14, font: f.bold });
    y -= 20;
  }
  if (title) {
    y -= 8;
    for (const line of wrap(f.regular, BODY_SIZE, drawable(f.regular, title), width)) {
      const w = f.regular.widthOfTextAtSize(line, BODY_SIZE);
      page.drawText(line, { x: (PAGE.width - w) / 2, y, size: BODY_SIZE, font: f.regular });
      y -= LINE;
    }
  }
}

/** Bates number at the bottom right and the legend at the bottom left of every page. */
function stamp(doc: PDFDocument, f: Fonts, s: RenderTask['stamp']) {
  doc.getPages().forEach((page, i) => {
    const { width } = page.getSize();
    const bates = batesNumber(s.prefix, s.padding, s.startSeq + i);
    const size = 9;
    const batesWidth = f.bold.widthOfTextAtSize(bates, size);
    const pad = 3;
    // A white band keeps the stamp legible over an original page's own footer.
    page.drawRectangle({
      x: width - 24 - batesWidth - pad,
      y: 14 - pad,
      width: batesWidth + 2 * pad,
      height: size + 2 * pad,
      color: rgb(1, 1, 1),
    });
    page.drawText(bates, { x: width - 24 - batesWidth, y: 14, size, font: f.bold });
    if (s.legend) {
      const legend = drawable(f.bold, s.legend);
      const legendWidth = f.bold.widthOfTextAtSize(legend, size);
      page.drawRectangle({
        x: 24 - pad,
        y: 14 - pad,
        width: legendWidth + 2 * pad,
        height: size + 2 * pad,
        color: rgb(1, 1, 1),
      });
      page.drawText(legend, { x: 24, y: 14, size, font: f.bold });
    }
  });
}

// ---- Rasterised pages with burned-in redactions ----

interface Pixmap {
  width: number;
  height: number;
  rgb: Buffer;
}

/** Netpbm binary PPM (P6), as pdftoppm writes it. */
function readPpm(data: Buffer): Pixmap {
  let at = 0;
  const tokens: string[] = [];
  while (tokens.length < 4) {
    while (at < data.length && /\s/.test(String.fromCharCode(data[at]))) at += 1;
    if (data[at] === 0x23) {
      while (at < data.length && data[at] !== 0x0a) at += 1;
      continue;
    }
    let token = '';
    while (at < data.length && !/\s/.test(String.fromCharCode(data[at])))
      token += String.fromCharCode(data[at++]);
    tokens.push(token);
  }
  at += 1; // the single white-space byte after maxval
  const [magic, w, h, max] = tokens;
  if (magic !== 'P6' || max !== '255') throw new Error('unexpected page image format');
  const width = Number(w);
  const height = Number(h);
  return { width, height, rgb: data.subarray(at, at + width * height * 3) };
}

/** PNG (ISO/IEC 15948): 8-bit RGB, filter 0 on every row, one zlib stream. */
export function encodePng(p: Pixmap): Buffer {
  const rows = Buffer.alloc((p.width * 3 + 1) * p.height);
  for (let y = 0; y < p.height; y++) {
    const to = y * (p.width * 3 + 1);
    rows[to] = 0;
    p.rgb.copy(rows, to + 1, y * p.width * 3, (y + 1) * p.width * 3);
  }
  const chunk = (type: string, body: Buffer) => {
    const head = Buffer.alloc(8);
    head.writeUInt32BE(body.length, 0);
    head.write(type, 4, 'latin1');
    const crc = Buffer.alloc(4);
    crc.writeUInt32BE(crc32(Buffer.concat([head.subarray(4), body])) >>> 0, 0);
    return Buffer.concat([head, body, crc]);
  };
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(p.width, 0);
  ihdr.writeUInt32BE(p.height, 4);
  ihdr[8] = 8; // bit depth
  ihdr[9] = 2; // colour type: RGB
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk('IHDR', ihdr),
    chunk('IDAT', deflateSync(rows, { level: 6 })),
    chunk('IEND', Buffer.alloc(0)),
  ]);
}

function paint(p: Pixmap, x0: number, y0: number, x1: number, y1: number) {
  const left = Math.max(0, Math.floor(x0));
  const right = Math.min(p.width, Math.ceil(x1));
  const top = Math.max(0, Math.floor(y0));
  const bottom = Math.min(p.height, Math.ceil(y1));
  for (let y = top; y < bottom; y++)
    p.rgb.fill(0, (y * p.width + left) * 3, (y * p.width + right) * 3);
}

const squash = (s: string) => s.replace(/\s+/g, '').toLowerCase();

interface PageItems {
  boxes: { x0: number; y0: number; x1: number; y1: number }[];
  joined: string;
  owner: number[];
}

/** Text items of each page with their boxes in pixels at the raster's scale (pdfjs-dist). */
async function pageTextItems(file: string, scale: number): Promise<PageItems[]> {
  const pdfjs = await import('pdfjs-dist/legacy/build/pdf.mjs');
  const data = new Uint8Array(await readFile(file));
  const task = pdfjs.getDocument({
    data,
    useSystemFonts: false,
    isEvalSupported: false,
    verbosity: 0,
  });
  const pdf = await task.promise;
  try {
    const pages: PageItems[] = [];
    for (let n = 1; n <= pdf.numPages; n++) {
      const page = await pdf.getPage(n);
      const viewport = page.getViewport({ scale });
      const content = await page.getTextContent();
      const out: PageItems = { boxes: [], joined: '', owner: [] };
      for (const item of content.items) {
        if (!('str' in item)) continue;
        const [a, b, c, d, e, f] = item.transform as number[];
        const size = Math.hypot(c, d) || Math.hypot(a, b) || item.height || 10;
        const corners = [
          viewport.convertToViewportPoint(e, f - size * 0.3),
          viewport.convertToViewportPoint(e + item.width, f + size * 1.0),
        ];
        const xs = corners.map((p) => p[0]);
        const ys = corners.map((p) => p[1]);
        const index = out.boxes.length;
        out.boxes.push({
          x0: Math.min(...xs) - 2,
          y0: Math.min(...ys) - 2,
          x1: Math.max(...xs) + 2,
          y1: Math.max(...ys) + 2,
        });
        const s = squash(item.str);
        out.joined += s;
        for (let i = 0; i < s.length; i++) out.owner.push(index);
      }
      pages.push(out);
    }
    return pages;
  } finally {
    await task.destroy();
  }
}

async function rasterisedWithRedactions(
  task: RenderTask,
  doc: PDFDocument,
): Promise<string | null> {
  const file = task.originalPath!;
  const dir = await mkdtemp(path.join(task.tmpDir, 'raster-'));
  try {
    const scale = RASTER_DPI / 72;
    const items = await pageTextItems(file, scale);
    // Which items each redacted string covers, on every page where it occurs.
    const cover = items.map(() => new Set<number>());
    for (const target of task.redactStrings.map(squash).filter((s) => s.length > 0)) {
      let found = false;
      items.forEach((page, n) => {
        for (
          let at = page.joined.indexOf(target);
          at >= 0;
          at = page.joined.indexOf(target, at + 1)
        ) {
          found = true;
          for (let i = at; i < at + target.length; i++) cover[n].add(page.owner[i]);
        }
      });
      if (!found) return 'a redacted passage was not found on the PDF pages';
    }
    await run('pdftoppm', ['-r', String(RASTER_DPI), file, path.join(dir, 'p')], {
      timeout: 120_000,
    });
    const files = (await readdir(dir)).filter((f) => f.endsWith('.ppm')).sort();
    if (files.length !== items.length) return 'the PDF pages could not all be rendered';
    for (const [n, name] of files.entries()) {
      const pix = readPpm(await readFile(path.join(dir, name)));
      for (const i of cover[n]) {
        const b = items[n].boxes[i];
        paint(pix, b.x0, b.y0, b.x1, b.y1);
      }
      for (const box of task.boxes.filter((bx) => bx.page === n + 1))
        paint(
          pix,
          box.x * pix.width,
          box.y * pix.height,
          (box.x + box.width) * pix.width,
          (box.y + box.height) * pix.height,
        );
      const image = await doc.embedPng(encodePng(pix));
      const page = doc.addPage([pix.width / scale, pix.height / scale]);
      page.drawImage(image, { x: 0, y: 0, width: pix.width / scale, height: pix.height / scale });
    }
    return null;
  } catch (error) {
    return `the PDF could not be rasterised (${(error as Error).message})`;
  } finally {
    await rm(dir, { recursive: true, force: true });
  }
}

async function originalPages(task: RenderTask, doc: PDFDocument): Promise<string | null> {
  try {
    const source = await PDFDocument.load(await readFile(task.originalPath!), {
      updateMetadata: false,
    });
    const pages = await doc.copyPages(source, source.getPageIndices());
    for (const page of pages) doc.addPage(page);
    return pages.length > 0 ? null : 'the PDF has no pages';
  } catch (error) {
    return `the PDF could not be read (${(error as Error).message})`;
  }
}

/** Renders, stamps and serialises one document. */
export async function renderDocument(task: RenderTask): Promise<RenderResult> {
  let doc = await PDFDocument.create();
  let f = await embedFonts(doc);
  let fallback: string | null = null;
  if (task.kind === 'slip' || task.kind === 'placeholder') {
    noticePage(doc, f, task.title, task.notice);
  } else if (task.kind === 'pdf') {
    const redacting = task.redactStrings.length > 0 || task.boxes.length > 0;
    fallback = redacting
      ? await rasterisedWithRedactions(task, doc)
      : await originalPages(task, doc);
    if (fallback) {
      // Start again on a clean document: nothing of the failed attempt may remain.
      doc = await PDFDocument.create();
      f = await embedFonts(doc);
      layout(doc, f, task);
    }
  } else {
    layout(doc, f, task);
  }
  stamp(doc, f, task.stamp);
  doc.setTitle(batesNumber(task.stamp.prefix, task.stamp.padding, task.stamp.startSeq));
  doc.setProducer('Quarry');
  doc.setCreator('Quarry');
  const pdf = await doc.save();
  return { pdf, pages: doc.getPageCount(), fallback };
}
