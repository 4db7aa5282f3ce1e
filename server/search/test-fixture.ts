// A small matter for the search and review API tests: the nine technical-memo titles of
// Deerwester, Dumais, Furnas, Landauer & Harshman (1990), "Indexing by latent semantic
// analysis", JASIS 41(6), Table 1 / Figure 4 (c1-c5 human-computer interaction, m1-m4
// graph theory), stored as real documents with invented metadata (custodians, dates,
// types) and indexed through the engine (raw counts, k = 2, terms in two or more
// documents: the paper's own set-up). Not a test file: the API tests import it.
import { ConceptSpace } from '../engine/index';
import type { TestApp, TestMatter } from '../../tests/helpers';
import { formatControlNumber } from '../documents/control-numbers';
import { saveConceptSpace } from '../indexing/persist';

export const DEERWESTER_TITLES = {
  c1: 'Human machine interface for ABC computer applications',
  c2: 'A survey of user opinion of computer system response time',
  c3: 'The EPS user interface management system',
  c4: 'System and human system engineering testing of EPS',
  c5: 'Relation of user perceived response time to error measurement',
  m1: 'The generation of random, binary, ordered trees',
  m2: 'The intersection graph of paths in trees',
  m3: 'Graph minors IV: Widths of trees and well-quasi-ordering',
  m4: 'Graph minors: A survey',
} as const;
export type MemoKey = keyof typeof DEERWESTER_TITLES;
export const MEMO_KEYS = Object.keys(DEERWESTER_TITLES) as MemoKey[];

/** Invented metadata (demo data, not from the paper). */
const META: Record<
  MemoKey,
  { custodian: 'Avery Example' | 'Blake Example'; sentAt: string | null; docType: string }
> = {
  c1: { custodian: 'Avery Example', sentAt: '2021-01-05T09:00:00.000Z', docType: 'email' },
  c2: { custodian: 'Avery Example', sentAt: '2021-02-10T09:00:00.000Z', docType: 'email' },
  c3: { custodian: 'Avery Example', sentAt: '2021-03-15T09:00:00.000Z', docType: 'pdf' },
  c4: { custodian: 'Blake Example', sentAt: '2021-04-20T09:00:00.000Z', docType: 'pdf' },
  c5: { custodian: 'Blake Example', sentAt: '2021-05-25T09:00:00.000Z', docType: 'docx' },
  m1: { custodian: 'Avery Example', sentAt: '2021-06-01T09:00:00.000Z', docType: 'text' },
  m2: { custodian: 'Blake Example', sentAt: '2021-07-04T09:00:00.000Z', docType: 'text' },
  m3: { custodian: 'Blake Example', sentAt: '2021-08-09T09:00:00.000Z', docType: 'text' },
  m4: { custodian: 'Blake Example', sentAt: null, docType: 'text' },
};

export interface MemoMatter {
  matter: TestMatter;
  ids: Record<MemoKey, number>;
  /** An exact duplicate of c1 held by the other custodian. */
  duplicateOfC1: number;
  custodians: Record<'Avery Example' | 'Blake Example', number>;
  controlNumbers: Record<number, string>;
}

/** Documents, texts (FTS via the triggers) and, unless withoutIndex, a ready index version. */
export async function buildMemoMatter(
  t: TestApp,
  options: { withoutIndex?: boolean } = {},
): Promise<MemoMatter> {
  const matter = await t.buildMatter();
  const db = t.ctx.db;
  const now = new Date().toISOString();
  const custodians = {} as MemoMatter['custodians'];
  for (const name of ['Avery Example', 'Blake Example'] as const) {
    const row = await db
      .insertInto('custodians')
      .values({ matter_id: matter.id, name, created_at: now })
      .returning('id')
      .executeTakeFirstOrThrow();
    custodians[name] = row.id;
  }
  const ids = {} as Record<MemoKey, number>;
  const controlNumbers: Record<number, string> = {};
  let seq = 0;
  const insert = async (
    key: string,
    meta: (typeof META)[MemoKey],
    title: string,
    extra: { status: 'extracted' | 'duplicate'; duplicateOf: number | null; sha: string },
  ) => {
    const controlNumber = formatControlNumber(matter.controlPrefix, ++seq);
    const row = await db
      .insertInto('documents')
      .values({
        matter_id: matter.id,
        custodian_id: custodians[meta.custodian],
        control_number: controlNumber,
        original_name: `${key}.txt`,
        original_path: `${key}.txt`,
        sha256: extra.sha,
        mime: 'text/plain',
        doc_type: meta.docType,
        size: title.length,
        title,
        author: `author-${key}@example.com`,
        recipients: `To: reader-${key}@example.com`,
        sent_at: meta.sentAt,
        extract_status: extra.status,
        duplicate_of: extra.duplicateOf,
        created_at: now,
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    controlNumbers[row.id] = controlNumber;
    return row.id;
  };
  for (const key of MEMO_KEYS) {
    ids[key] = await insert(key, META[key], DEERWESTER_TITLES[key], {
      status: 'extracted',
      duplicateOf: null,
      sha: key.padEnd(64, '0'),
    });
    await db
      .insertInto('document_texts')
      .values({ document_id: ids[key], title: '', body: DEERWESTER_TITLES[key] })
      .execute();
  }
  const duplicateOfC1 = await insert(
    'c1-copy',
    { ...META.c1, custodian: 'Blake Example' },
    DEERWESTER_TITLES.c1,
    {
      status: 'duplicate',
      duplicateOf: ids.c1,
      sha: 'c1'.padEnd(64, '0'),
    },
  );
  if (!options.withoutIndex)
    await indexMatter(
      t,
      matter.id,
      MEMO_KEYS.map((k) => ({ id: ids[k], text: DEERWESTER_TITLES[k] })),
    );
  return { matter, ids, duplicateOfC1, custodians, controlNumbers };
}

/** Builds a concept space through the engine and makes it the matter's serving version. */
export async function indexMatter(
  t: TestApp,
  matterId: number,
  docs: { id: number; text: string }[],
  options: { k?: number; weighting?: 'raw' | 'log-entropy'; minDf?: number } = {},
): Promise<number> {
  const { space, diagnostics } = ConceptSpace.build(docs, {
    k: options.k ?? 2,
    weighting: options.weighting ?? 'raw',
    minDf: options.minDf ?? 2,
  });
  const indexId = await saveConceptSpace(t.ctx.db, space, diagnostics, {
    matterId,
    version: 1,
  });
  await t.ctx.db
    .updateTable('matters')
    .set({ current_index_id: indexId })
    .where('id', '=', matterId)
    .execute();
  t.ctx.index.invalidate(matterId);
  return indexId;
}
