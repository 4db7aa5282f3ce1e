// Checks the demo corpus against what the README promises: size and formats,
// byte-identical duplicates, broken files that really are broken, determinism, and the
// demo queries' claim that concept search finds documents keyword search cannot.
//
// "No shared key word" uses the engine's analyzer (natural's English stop words and
// the Porter 1980 stemmer); the concept check builds an LSI space (Deerwester et al.
// 1990) with the engine and asks for the expected documents in the top 25.
import { createHash } from 'node:crypto';
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { simpleParser } from 'mailparser';
import mammoth from 'mammoth';
import { PDFParse } from 'pdf-parse';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ConceptSpace } from '../server/engine/index';
import { conceptRanking } from '../server/engine/index';
import { analyze } from '../server/engine/index';
import {
  generateDemoCorpus,
  planDemoCorpus,
  type DemoCorpusManifest,
  type PlannedDocument,
} from './generate';

let dirA: string;
let dirB: string;
let manifest: DemoCorpusManifest;
let manifestB: DemoCorpusManifest;
let plan: PlannedDocument[];

beforeAll(async () => {
  dirA = await mkdtemp(path.join(tmpdir(), 'quarry-corpus-a-'));
  dirB = await mkdtemp(path.join(tmpdir(), 'quarry-corpus-b-'));
  manifest = await generateDemoCorpus(dirA);
  manifestB = await generateDemoCorpus(dirB);
  plan = planDemoCorpus();
}, 60_000);

afterAll(async () => {
  await rm(dirA, { recursive: true, force: true });
  await rm(dirB, { recursive: true, force: true });
});

const sha256 = (data: Buffer) => createHash('sha256').update(data).digest('hex');
const read = (relative: string) => readFile(path.join(dirA, ...relative.split('/')));

async function pdfText(data: Buffer): Promise<string> {
  const parser = new PDFParse({ data });
  try {
    return (await parser.getText()).text;
  } finally {
    await parser.destroy();
  }
}

/** Text as an independent extractor sees it (pdf-parse, mammoth, mailparser, UTF-8). */
async function extractedText(relative: string): Promise<string> {
  const data = await read(relative);
  if (relative.endsWith('.pdf')) return pdfText(data);
  if (relative.endsWith('.docx')) return (await mammoth.extractRawText({ buffer: data })).value;
  if (relative.endsWith('.eml')) {
    const mail = await simpleParser(data);
    const names = [mail.from, ...(Array.isArray(mail.to) ? mail.to : [mail.to])]
      .filter((address) => address !== undefined)
      .map((address) => address.text);
    return [mail.subject ?? '', ...names, mail.text ?? ''].join('\n');
  }
  return data.toString('utf8');
}

describe('demo corpus contents', () => {
  it('has at least 300 readable documents in every promised format', () => {
    const readable = manifest.files.filter((file) => !file.brokenReason);
    expect(readable.length).toBeGreaterThanOrEqual(300);
    const formats = new Set(readable.map((file) => file.format));
    for (const format of ['pdf', 'docx', 'eml', 'txt', 'html', 'md'] as const)
      expect(formats).toContain(format);
    const attachmentFormats = new Set(
      manifest.files.flatMap((file) => (file.attachments ?? []).map((a) => a.format)),
    );
    for (const format of ['pdf', 'docx', 'txt'] as const)
      expect(attachmentFormats).toContain(format);
    expect(manifest.custodians.length).toBeGreaterThanOrEqual(6);
    expect(manifest.topics.length).toBeGreaterThanOrEqual(6);
    for (const topic of manifest.topics) {
      expect(
        manifest.files.filter((file) => file.topics.includes(topic.id)).length,
      ).toBeGreaterThanOrEqual(15);
    }
    // Orders are 1..n in path order: the load order the README quotes.
    expect(manifest.files.map((file) => file.order)).toEqual(
      manifest.files.map((_file, index) => index + 1),
    );
    expect([...manifest.files.map((file) => file.path)].sort()).toEqual(
      manifest.files.map((file) => file.path),
    );
  });

  it('uses only reserved example domains for e-mail addresses (RFC 2606)', async () => {
    const emails = manifest.files.filter((file) => file.format === 'eml').slice(0, 40);
    for (const file of emails) {
      const raw = (await read(file.path)).toString('utf8');
      const addresses = raw.match(/[\w.+-]+@[\w.-]+\.[a-z]{2,}/gi) ?? [];
      expect(addresses.length).toBeGreaterThan(0);
      for (const address of addresses) {
        const domain = address.split('@')[1].toLowerCase();
        expect(domain, address).toMatch(/(^|\.)example(\.com|\.net)?$/);
      }
    }
  });

  it('lists files whose bytes match the manifest, and duplicates identical to their originals', async () => {
    for (const file of manifest.files.filter((_f, index) => index % 7 === 0)) {
      const data = await read(file.path);
      expect(data.length).toBe(file.bytes);
      expect(sha256(data)).toBe(file.sha256);
    }
    const duplicates = manifest.files.filter((file) => file.duplicateOf);
    expect(duplicates.length).toBeGreaterThanOrEqual(10);
    for (const duplicate of duplicates) {
      const original = manifest.files.find((file) => file.path === duplicate.duplicateOf);
      expect(original, duplicate.path).toBeDefined();
      expect(original?.custodian).not.toBe(duplicate.custodian);
      expect(sha256(await read(duplicate.path))).toBe(sha256(await read(original!.path)));
    }
    expect(duplicates.some((file) => file.format === 'eml')).toBe(true);
    expect(duplicates.some((file) => file.format === 'pdf')).toBe(true);
  });

  it('includes broken files that are broken for the stated reason', async () => {
    const broken = manifest.files.filter((file) => file.brokenReason);
    const byReason = (prefix: string) => {
      const found = broken.find((file) => file.brokenReason?.startsWith(prefix));
      expect(found, prefix).toBeDefined();
      return found!.path;
    };
    // Structure facts from ISO 32000-1:2008 §7.5 (header %PDF-, trailer, %%EOF) and
    // ECMA-376 Part 2 (an OOXML package is a ZIP, which starts with "PK\x03\x04").
    const truncated = await read(byReason('truncated PDF'));
    expect(truncated.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    expect(truncated.includes('%%EOF')).toBe(false);
    await expect(pdfText(truncated)).rejects.toThrow();

    const random = await read(byReason('not a PDF'));
    expect(random.subarray(0, 5).toString('latin1')).not.toBe('%PDF-');

    const encrypted = await read(byReason('encrypted PDF'));
    expect(encrypted.includes('/Encrypt')).toBe(true);
    await expect(pdfText(encrypted)).rejects.toThrow(/password/i);

    const notZip = await read(byReason('not a DOCX'));
    expect(notZip.subarray(0, 2).toString('latin1')).not.toBe('PK');
    await expect(mammoth.extractRawText({ buffer: notZip })).rejects.toThrow();

    expect((await read(byReason('empty file'))).length).toBe(0);

    const imageOnly = await read(byReason('image-only PDF'));
    expect((await pdfText(imageOnly)).replace(/--\s*\d+ of \d+\s*--/g, '')).not.toMatch(/\p{L}/u);

    const unsupported = byReason('unsupported type');
    expect(path.extname(unsupported)).toBe('.dwg');
  });

  it('is deterministic: a second run writes identical bytes', async () => {
    expect(manifestB.files.map((file) => [file.path, file.sha256])).toEqual(
      manifest.files.map((file) => [file.path, file.sha256]),
    );
    for (const file of manifest.files.filter((_f, index) => index % 25 === 0)) {
      const a = await read(file.path);
      const b = await readFile(path.join(dirB, ...file.path.split('/')));
      expect(a.equals(b), file.path).toBe(true);
    }
  });
});

describe('demo queries', () => {
  it('have three or more queries whose expected documents share no stemmed key word with the query', async () => {
    expect(manifest.demoQueries.length).toBeGreaterThanOrEqual(3);
    for (const query of manifest.demoQueries) {
      const queryTerms = new Set(analyze(query.query));
      expect(queryTerms.size).toBeGreaterThan(0);
      for (const expectedPath of query.expected) {
        const planned = plan.find((doc) => doc.path === expectedPath);
        expect(planned, expectedPath).toBeDefined();
        const shared = [
          ...analyze(planned!.text),
          ...analyze(await extractedText(expectedPath)),
        ].filter((term) => queryTerms.has(term));
        expect(shared, `${expectedPath} shares ${shared.join(', ')} with "${query.query}"`).toEqual(
          [],
        );
      }
      // Keyword search has something to find: other documents do use the query's words.
      const keywordHits = plan.filter((doc) =>
        analyze(doc.text).some((term) => queryTerms.has(term)),
      );
      expect(keywordHits.length).toBeGreaterThanOrEqual(10);
      expect(query.expectedOrder).toEqual(
        query.expected.map(
          (expectedPath) => manifest.files.find((file) => file.path === expectedPath)?.order,
        ),
      );
    }
  });

  // k from 20 to 30 suits a corpus of ~310 documents on 6 topics and 8 kinds of office
  // notice; a k near the number of documents reproduces keyword matching (Deerwester et
  // al. 1990 §5 discuss the choice of k; the value here is tuned on this corpus).
  for (const k of [20, 30]) {
    it(`rank the expected documents in the top 25 of an engine concept space (k = ${k})`, () => {
      const readable = plan.filter((doc) => !doc.brokenReason && doc.text.length > 0);
      const { space } = ConceptSpace.build(
        readable.map((doc) => ({ id: doc.path, text: doc.text })),
        { k },
      );
      for (const query of manifest.demoQueries) {
        const top = conceptRanking(space, query.query, 25).ranked.map((hit) => hit.id);
        for (const expectedPath of query.expected) {
          expect(top, `"${query.query}" should find ${expectedPath}`).toContain(expectedPath);
        }
      }
    });
  }
});
