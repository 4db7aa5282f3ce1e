// Reader for the Cranfield 1400 collection in its SMART distribution (Cleverdon,
// Mills & Keen 1966; files cran.all.1400, cran.qry, cranqrel from the University
// of Glasgow IR group). Fields: .I id, .T title, .A authors, .B bibliography,
// .W text.
//
// Pitfall handled here: the ids after .I in cran.qry are not 1..225 (they skip
// numbers); cranqrel numbers the queries 1..225 by their position in the file, so
// query ids are assigned by position.
//
// Relevance codes (cranqrel.readme, after Cleverdon): 1 = complete answer ...
// 4 = minimum interest; -1 = no interest. Graded gain for nDCG: grade = 5 - code,
// so code 1 (most relevant) has grade 4 and code 4 grade 1; -1 rows are dropped.
import { existsSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import type { Qrels } from './metrics';
import type { EvalDocument, EvalQuery } from './readers';

/** ../shared/data/cranfield relative to the project root (CI keeps it there). */
export function cranfieldDir(projectRoot = process.cwd()): string {
  return resolve(projectRoot, '..', 'shared', 'data', 'cranfield');
}

export function cranfieldAvailable(dir = cranfieldDir()): boolean {
  return ['cran.all.1400', 'cran.qry', 'cranqrel'].every((f) => existsSync(join(dir, f)));
}

interface SmartRecord {
  id: string;
  fields: Record<string, string>;
}

function parseSmart(text: string, file: string): SmartRecord[] {
  const records: SmartRecord[] = [];
  let current: SmartRecord | null = null;
  let field: string | null = null;
  text.split(/\r?\n/).forEach((line, i) => {
    const header = /^\.([A-Z])(?:\s+(.*))?$/.exec(line);
    if (header) {
      if (header[1] === 'I') {
        const id = (header[2] ?? '').trim();
        if (!id) throw new Error(`${file}:${i + 1}: .I without an id`);
        current = { id, fields: {} };
        records.push(current);
        field = null;
      } else {
        if (!current) throw new Error(`${file}:${i + 1}: .${header[1]} before the first .I`);
        field = header[1];
        current.fields[field] = '';
      }
      return;
    }
    if (current && field) {
      const rec: SmartRecord = current;
      rec.fields[field] += (rec.fields[field] ? '\n' : '') + line;
    }
  });
  return records;
}

export interface CranfieldCollection {
  docs: EvalDocument[];
  queries: EvalQuery[];
  qrels: Qrels;
}

export function readCranfield(dir = cranfieldDir()): CranfieldCollection {
  const read = (f: string) => readFileSync(join(dir, f), 'latin1');
  const docs = parseSmart(read('cran.all.1400'), 'cran.all.1400').map((r) => ({
    id: r.id,
    title: (r.fields.T ?? '').trim(),
    text: (r.fields.W ?? '').trim(),
  }));
  const queries = parseSmart(read('cran.qry'), 'cran.qry').map((r, position) => ({
    id: String(position + 1),
    text: (r.fields.W ?? '').trim(),
  }));
  const qrels: Qrels = new Map();
  read('cranqrel')
    .split(/\r?\n/)
    .forEach((line, i) => {
      const fields = line.trim().split(/\s+/);
      if (fields.length === 1 && fields[0] === '') return;
      if (fields.length !== 3) throw new Error(`cranqrel:${i + 1}: expected "query doc code"`);
      const [qid, docid, codeText] = fields;
      const code = Number(codeText);
      if (code < 1 || code > 4) return; // -1: no interest
      let judged = qrels.get(qid);
      if (!judged) {
        judged = new Map();
        qrels.set(qid, judged);
      }
      judged.set(docid, Math.max(5 - code, judged.get(docid) ?? 0));
    });
  return { docs, queries, qrels };
}

/** The collection in Quarry's eval formats (docs.jsonl, queries.jsonl, TREC qrels). */
export function cranfieldAsFiles(c: CranfieldCollection): {
  docs: string;
  queries: string;
  qrels: string;
} {
  const qrelLines: string[] = [];
  for (const [qid, judged] of c.qrels)
    for (const [docid, grade] of judged) qrelLines.push(`${qid} 0 ${docid} ${grade}`);
  return {
    docs: c.docs.map((d) => JSON.stringify(d)).join('\n') + '\n',
    queries: c.queries.map((q) => JSON.stringify(q)).join('\n') + '\n',
    qrels: qrelLines.join('\n') + '\n',
  };
}

/**
 * Converter: `node --import tsx server/engine/eval/cranfield.ts <out-dir> [cranfield-dir]`
 * writes docs.jsonl, queries.jsonl and qrels.txt for `quarry eval`.
 */
async function main(argv: string[]): Promise<void> {
  const [outDir, sourceDir] = argv;
  if (!outDir) {
    console.error(
      'usage: node --import tsx server/engine/eval/cranfield.ts <out-dir> [cranfield-dir]',
    );
    process.exit(2);
  }
  const dir = sourceDir ?? cranfieldDir();
  if (!cranfieldAvailable(dir)) {
    console.error(`cranfield: cran.all.1400, cran.qry and cranqrel not found in ${dir}`);
    process.exit(1);
  }
  const { mkdirSync, writeFileSync } = await import('node:fs');
  const files = cranfieldAsFiles(readCranfield(dir));
  mkdirSync(outDir, { recursive: true });
  writeFileSync(join(outDir, 'docs.jsonl'), files.docs);
  writeFileSync(join(outDir, 'queries.jsonl'), files.queries);
  writeFileSync(join(outDir, 'qrels.txt'), files.qrels);
  console.log(`wrote docs.jsonl, queries.jsonl, qrels.txt to ${outDir}`);
}

if (process.argv[1] && import.meta.url === pathToFileURL(resolve(process.argv[1])).href) {
  void main(process.argv.slice(2));
}
