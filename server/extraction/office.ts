// Spreadsheets and slide decks: XLSX (ECMA-376 SpreadsheetML, read with exceljs) sheet by
// sheet, CSV (RFC 4180, read with csv-parse) and PPTX (ECMA-376 PresentationML: slide
// text and speaker notes, read straight from the package's XML).
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { decodeText } from './charset';
import { applyCoreProperties, blank, decodeXml, Refused, tidyText, type Fields } from './fields';
import type { ExtractLimits } from './types';
import { inflatesWithin, listZipNames, readZipEntry } from './zip-names';

/** Largest inflated size accepted for an OOXML package read in memory (as for DOCX). */
const MAX_INFLATED_FACTOR = 4;

async function checkPackage(
  filePath: string,
  limits: ExtractLimits,
  mainPart: string,
  invalid: 'not a valid spreadsheet' | 'not a valid presentation',
): Promise<string[]> {
  const names = await listZipNames(filePath);
  if (!names || !names.includes(mainPart)) throw new Refused(invalid);
  const inflated = await inflatesWithin(filePath, limits.maxFileBytes * MAX_INFLATED_FACTOR);
  if (inflated === 'corrupt') throw new Refused(invalid);
  if (inflated === 'too large') throw new Refused('file exceeds the size limit');
  return names;
}

async function coreOf(filePath: string, fields: Fields): Promise<void> {
  const core = await readZipEntry(filePath, 'docProps/core.xml', 1024 * 1024);
  if (core) applyCoreProperties(fields, core.toString('utf8'));
}

/** A cell's text as the spreadsheet shows it (exceljs `cell.text`: formatted value or result). */
function cellText(cell: { text?: string }): string {
  try {
    return (cell.text ?? '').replace(/\s+/g, ' ').trim();
  } catch {
    return '';
  }
}

export async function extractXlsx(filePath: string, limits: ExtractLimits): Promise<Fields> {
  await checkPackage(filePath, limits, 'xl/workbook.xml', 'not a valid spreadsheet');
  const ExcelJS = (await import('exceljs')).default;
  const workbook = new ExcelJS.Workbook();
  try {
    await workbook.xlsx.readFile(filePath);
  } catch {
    throw new Refused('not a valid spreadsheet');
  }
  const sections: string[] = [];
  workbook.eachSheet((sheet) => {
    const lines: string[] = [];
    sheet.eachRow({ includeEmpty: false }, (row) => {
      const cells: string[] = [];
      row.eachCell({ includeEmpty: false }, (cell) => {
        const text = cellText(cell);
        if (text) cells.push(text);
      });
      if (cells.length) lines.push(cells.join('\t'));
    });
    sections.push(`Sheet: ${sheet.name}\n${lines.join('\n')}`);
  });
  const fields = blank();
  fields.text = tidyText(sections.join('\n\n'));
  fields.pageCount = sections.length || null;
  await coreOf(filePath, fields);
  return fields;
}

export async function extractCsv(filePath: string, charset: string | undefined): Promise<Fields> {
  const decoded = decodeText(await readFile(filePath), charset);
  const { parse } = await import('csv-parse/sync');
  let rows: string[][];
  try {
    rows = parse(decoded.text, {
      relax_column_count: true,
      relax_quotes: true,
      skip_empty_lines: true,
      bom: true,
    }) as string[][];
  } catch {
    // A file named .csv that is not well-formed CSV is still text worth reading.
    rows = decoded.text.split(/\r?\n/).map((line) => [line]);
  }
  const fields = blank();
  fields.charset = decoded.charset;
  fields.text = tidyText(
    rows
      .map((row) =>
        row
          .map((v) => v.replace(/\s+/g, ' ').trim())
          .filter(Boolean)
          .join('\t'),
      )
      .filter(Boolean)
      .join('\n'),
  );
  return fields;
}

// ---- PPTX ------------------------------------------------------------------------------

const PART_LIMIT = 16 * 1024 * 1024;

/** Text of DrawingML paragraphs (<a:p>, runs <a:t>), one line per paragraph. */
export function drawingText(xml: string): string {
  const paragraphs = xml.match(/<a:p[\s>][\s\S]*?<\/a:p>|<a:p\/>/g) ?? [];
  return paragraphs
    .map((p) =>
      (p.match(/<a:t(?:\s[^>]*)?>([\s\S]*?)<\/a:t>/g) ?? [])
        .map((t) => decodeXml(t.replace(/^<a:t(?:\s[^>]*)?>|<\/a:t>$/g, '')))
        .join(''),
    )
    .filter((line) => line.trim() !== '')
    .join('\n');
}

/** Relationship id -> target part (OPC, ECMA-376 Part 2 §9.3), resolved against the source part. */
function relationships(
  xml: string,
  sourcePart: string,
): Map<string, { type: string; target: string }> {
  const out = new Map<string, { type: string; target: string }>();
  for (const rel of xml.match(/<Relationship\s[^>]*>/g) ?? []) {
    const id = /\sId="([^"]+)"/.exec(rel)?.[1];
    const target = /\sTarget="([^"]+)"/.exec(rel)?.[1];
    const type = /\sType="([^"]+)"/.exec(rel)?.[1] ?? '';
    if (!id || !target) continue;
    const resolved = target.startsWith('/')
      ? target.slice(1)
      : path.posix.normalize(path.posix.join(path.posix.dirname(sourcePart), target));
    out.set(id, { type, target: decodeXml(resolved) });
  }
  return out;
}

const relsPathOf = (part: string) =>
  path.posix.join(path.posix.dirname(part), '_rels', `${path.posix.basename(part)}.rels`);

export async function extractPptx(filePath: string, limits: ExtractLimits): Promise<Fields> {
  const names = await checkPackage(
    filePath,
    limits,
    'ppt/presentation.xml',
    'not a valid presentation',
  );
  const read = async (part: string) =>
    (await readZipEntry(filePath, part, PART_LIMIT))?.toString('utf8') ?? null;
  const presentation = (await read('ppt/presentation.xml')) ?? '';
  const rels = relationships(
    (await read(relsPathOf('ppt/presentation.xml'))) ?? '',
    'ppt/presentation.xml',
  );
  // Slide order is the order of <p:sldId r:id> in the slide list (ECMA-376 Part 1 §19.2.1.34).
  let slides = (presentation.match(/<p:sldId\s[^>]*>/g) ?? [])
    .map((tag) => /\sr:id="([^"]+)"/.exec(tag)?.[1])
    .map((id) => (id ? rels.get(id)?.target : undefined))
    .filter((part): part is string => Boolean(part && names.includes(part)));
  if (slides.length === 0) {
    const number = (name: string) => Number(/(\d+)\.xml$/.exec(name)?.[1] ?? 0);
    slides = names
      .filter((n) => /^ppt\/slides\/slide\d+\.xml$/.test(n))
      .sort((a, b) => number(a) - number(b));
  }
  const sections: string[] = [];
  for (const [index, part] of slides.entries()) {
    const xml = await read(part);
    if (xml === null) throw new Refused('not a valid presentation');
    const slideRels = relationships((await read(relsPathOf(part))) ?? '', part);
    const notesPart = [...slideRels.values()].find((r) => r.type.endsWith('/notesSlide'))?.target;
    const notesXml = notesPart ? await read(notesPart) : null;
    // Notes pages repeat the slide number and image placeholders; keep the body text only.
    const notes = notesXml
      ? drawingText(
          notesXml.replace(/<p:sp>(?:(?!<\/p:sp>)[\s\S])*?type="sldNum"[\s\S]*?<\/p:sp>/g, ''),
        )
      : '';
    sections.push(
      [`Slide ${index + 1}`, drawingText(xml), notes && `Notes:\n${notes}`]
        .filter(Boolean)
        .join('\n'),
    );
  }
  const fields = blank();
  fields.text = tidyText(sections.join('\n\n'));
  fields.pageCount = slides.length || null;
  await coreOf(filePath, fields);
  return fields;
}
