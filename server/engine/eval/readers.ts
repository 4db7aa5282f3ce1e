// Readers for the evaluation inputs: docs.jsonl {"id","title","text"},
// queries.jsonl {"id","text"}, and TREC qrels lines "qid 0 docid grade" (grade > 0
// relevant; TREC's qrels format, trec_eval). Every error names the file and line.
import { readFileSync } from 'node:fs';
import type { Qrels } from './metrics';

export interface EvalDocument {
  id: string;
  title: string;
  text: string;
}

export interface EvalQuery {
  id: string;
  text: string;
}

export class EvalInputError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'EvalInputError';
  }
}

function readText(file: string): string {
  try {
    return readFileSync(file, 'utf8');
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    if (code === 'ENOENT') throw new EvalInputError(`${file}: no such file`);
    if (code === 'EISDIR') throw new EvalInputError(`${file}: is a directory, expected a file`);
    throw new EvalInputError(`${file}: cannot read (${code ?? String(error)})`);
  }
}

function* lines(text: string): Generator<[number, string]> {
  const all = text.split(/\r?\n/);
  for (let i = 0; i < all.length; i++) {
    const line = all[i].trim();
    if (line !== '') yield [i + 1, line];
  }
}

function idOf(value: unknown): string | null {
  if (typeof value === 'string' && value.trim() !== '') return value;
  if (typeof value === 'number' && Number.isFinite(value)) return String(value);
  return null;
}

function parseJsonObject(file: string, lineNo: number, line: string): Record<string, unknown> {
  let value: unknown;
  try {
    value = JSON.parse(line);
  } catch (error) {
    throw new EvalInputError(`${file}:${lineNo}: not valid JSON (${(error as Error).message})`);
  }
  if (value === null || typeof value !== 'object' || Array.isArray(value)) {
    throw new EvalInputError(`${file}:${lineNo}: expected a JSON object`);
  }
  return value as Record<string, unknown>;
}

export function parseDocsJsonl(text: string, file = 'docs.jsonl'): EvalDocument[] {
  const docs: EvalDocument[] = [];
  const seen = new Set<string>();
  for (const [lineNo, line] of lines(text)) {
    const o = parseJsonObject(file, lineNo, line);
    const id = idOf(o.id);
    if (id === null)
      throw new EvalInputError(`${file}:${lineNo}: "id" must be a non-empty string or a number`);
    if (seen.has(id))
      throw new EvalInputError(`${file}:${lineNo}: document id "${id}" appears twice`);
    if (o.title !== undefined && typeof o.title !== 'string') {
      throw new EvalInputError(`${file}:${lineNo}: "title" must be a string`);
    }
    if (typeof o.text !== 'string')
      throw new EvalInputError(`${file}:${lineNo}: "text" must be a string`);
    seen.add(id);
    docs.push({ id, title: (o.title as string | undefined) ?? '', text: o.text });
  }
  return docs;
}

export function parseQueriesJsonl(text: string, file = 'queries.jsonl'): EvalQuery[] {
  const queries: EvalQuery[] = [];
  const seen = new Set<string>();
  for (const [lineNo, line] of lines(text)) {
    const o = parseJsonObject(file, lineNo, line);
    const id = idOf(o.id);
    if (id === null)
      throw new EvalInputError(`${file}:${lineNo}: "id" must be a non-empty string or a number`);
    if (seen.has(id)) throw new EvalInputError(`${file}:${lineNo}: query id "${id}" appears twice`);
    if (typeof o.text !== 'string')
      throw new EvalInputError(`${file}:${lineNo}: "text" must be a string`);
    seen.add(id);
    queries.push({ id, text: o.text });
  }
  return queries;
}

export function parseQrels(text: string, file = 'qrels.txt'): Qrels {
  const qrels: Qrels = new Map();
  for (const [lineNo, line] of lines(text)) {
    const fields = line.split(/\s+/);
    if (fields.length !== 4) {
      throw new EvalInputError(
        `${file}:${lineNo}: expected "qid 0 docid grade", got ${fields.length} fields`,
      );
    }
    const [qid, , docid, gradeText] = fields;
    if (!/^-?\d+$/.test(gradeText)) {
      throw new EvalInputError(
        `${file}:${lineNo}: grade must be a whole number, got "${gradeText}"`,
      );
    }
    const grade = Number(gradeText);
    if (grade <= 0) continue;
    let judged = qrels.get(qid);
    if (!judged) {
      judged = new Map();
      qrels.set(qid, judged);
    }
    judged.set(docid, Math.max(grade, judged.get(docid) ?? 0));
  }
  return qrels;
}

export function readDocsJsonl(file: string): EvalDocument[] {
  return parseDocsJsonl(readText(file), file);
}

export function readQueriesJsonl(file: string): EvalQuery[] {
  return parseQueriesJsonl(readText(file), file);
}

export function readQrels(file: string): Qrels {
  return parseQrels(readText(file), file);
}
