// Families, duplicates, custodians, threads and near-duplicates through the API: the
// top-level item is the unit of de-duplication (attachments stay with their parent), an
// e-mail collected twice with different bytes is one document, every custodian who held a
// copy is kept and found by the custodian filters (document list and search), and a reply
// (RFC 5322 §3.6.4 In-Reply-To) joins its thread.
import { parse } from 'csv-parse/sync';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeEml, makePdf, makeText } from '../../corpus-demo/render';
import type {
  DocumentDetailResponse,
  DocumentListItem,
  UploadBatchResponse,
} from '../../shared/schemas/documents';
import type { JobResponse } from '../../shared/schemas/jobs';
import type { NearDuplicatesResponse, ThreadResponse } from '../../shared/schemas/relationships';
import {
  createTestApp,
  type Agent,
  type TestApp,
  type TestMatter,
  bytesBody,
} from '../../tests/helpers';

let t: TestApp;
let matter: TestMatter;
let lead: Agent;

async function waitForJob(jobId: number | null) {
  if (jobId === null) return;
  const deadline = Date.now() + 120_000;
  for (;;) {
    const job = ((await lead.get(`/api/jobs/${jobId}`)).body as JobResponse).job;
    if (job.status === 'succeeded' || job.status === 'failed') return;
    if (Date.now() > deadline) throw new Error(`job ${jobId} still ${job.status}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

async function upload(files: { name: string; content: Buffer }[], custodian: string) {
  let req = lead.post(`/api/matters/${matter.id}/documents`).field('custodian', custodian);
  for (const f of files) req = req.attach('files', f.content, f.name);
  const res = await req;
  expect(res.status).toBe(201);
  const batch = res.body as UploadBatchResponse;
  await waitForJob(batch.jobId);
  return batch;
}

async function list(query = ''): Promise<DocumentListItem[]> {
  const res = await lead.get(`/api/matters/${matter.id}/documents?pageSize=500${query}`);
  expect(res.status).toBe(200);
  return res.body.documents;
}

const detail = async (id: number) =>
  (await lead.get(`/api/matters/${matter.id}/documents/${id}`)).body as DocumentDetailResponse;

const names = (refs: { name: string }[]) => refs.map((r) => r.name).sort();

const sent = new Date('2022-03-01T09:30:00Z');
let original: Buffer;
let attachment: Buffer;

beforeAll(async () => {
  t = await createTestApp();
  matter = await t.buildMatter({ controlPrefix: 'REL' });
  lead = await t.agentFor(matter.lead);
  attachment = await makePdf({
    title: 'Milling specification',
    author: 'Ann Miller',
    pages: ['Moisture content of the wheat flour shall not exceed fourteen percent.'],
  });
  original = await makeEml({
    from: 'Ann Miller <ann@mill.example>',
    to: ['Ben Baker <ben@bakery.example>'],
    cc: ['Cy Clerk <cy@bakery.example>'],
    subject: 'Flour specification',
    date: sent,
    messageId: '<spec-1@mill.example>',
    text: 'Please find the milling specification attached. Moisture limits apply from April.',
    attachments: [{ filename: 'spec.pdf', contentType: 'application/pdf', content: attachment }],
  });
}, 30_000);

afterAll(async () => {
  await t?.close();
});

describe('families, duplicates and all custodians', () => {
  let email: DocumentListItem;

  it('stores the e-mail header fields apart, and its attachment in its family with the family date', async () => {
    await upload([{ name: 'spec.eml', content: original }], 'Ann Miller');
    const docs = await list();
    email = docs.find((d) => d.name === 'spec.eml')!;
    const child = docs.find((d) => d.parentId === email.id)!;
    expect(email).toMatchObject({
      status: 'extracted',
      familyId: email.id,
      familyDate: sent.toISOString(),
      emailFrom: 'Ann Miller <ann@mill.example>',
      emailTo: 'Ben Baker <ben@bakery.example>',
      emailCc: 'Cy Clerk <cy@bakery.example>',
      messageId: '<spec-1@mill.example>',
      ocr: false,
    });
    expect(child).toMatchObject({
      name: 'spec.pdf',
      status: 'extracted',
      familyId: email.id,
      familyDate: sent.toISOString(),
      author: 'Ann Miller',
    });
  });

  it('the same e-mail from a second custodian, as the same bytes and as other bytes, is suppressed; both custodians stay', async () => {
    // Other bytes, same message: a mail store added a Received trace field (RFC 5321 §4.4).
    const rewritten = Buffer.concat([
      Buffer.from(
        'Received: from mx.bakery.example by store.bakery.example; Tue, 1 Mar 2022 09:31:00 +0000\r\n',
      ),
      original,
    ]);
    await upload(
      [
        { name: 'copy.eml', content: original },
        { name: 'copy-from-store.eml', content: rewritten },
      ],
      'Ben Baker',
    );
    const docs = await list();
    const byName = new Map(docs.map((d) => [d.name, d]));
    expect(byName.get('copy.eml')).toMatchObject({ status: 'duplicate', duplicateOf: email.id });
    expect(byName.get('copy-from-store.eml')).toMatchObject({
      status: 'duplicate',
      duplicateOf: email.id,
    });
    // The suppressed copies' attachments were never made: the family is the unit.
    expect(docs.filter((d) => d.name === 'spec.pdf')).toHaveLength(1);
    const kept = await detail(email.id);
    expect(names(kept.document.allCustodians)).toEqual(['Ann Miller', 'Ben Baker']);
    expect(kept.duplicates).toHaveLength(2);
    // The kept e-mail's attachment lists both custodians too.
    const child = (await list()).find((d) => d.parentId === email.id)!;
    expect(names(child.allCustodians)).toEqual(['Ann Miller', 'Ben Baker']);
  });

  it("an attachment identical to another family's document is kept with its own parent, not suppressed", async () => {
    const other = await makeEml({
      from: 'Cy Clerk <cy@bakery.example>',
      to: ['Ann Miller <ann@mill.example>'],
      subject: 'Specification for the file',
      date: new Date('2022-03-05T10:00:00Z'),
      text: 'Filing the specification you sent.',
      attachments: [{ filename: 'spec.pdf', contentType: 'application/pdf', content: attachment }],
    });
    await upload([{ name: 'filing.eml', content: other }], 'Cy Clerk');
    const docs = await list();
    const filing = docs.find((d) => d.name === 'filing.eml')!;
    const child = docs.find((d) => d.parentId === filing.id)!;
    expect(child).toMatchObject({
      name: 'spec.pdf',
      status: 'extracted',
      duplicateOf: null,
      familyId: filing.id,
      familyDate: '2022-03-05T10:00:00.000Z',
    });
    expect(names(child.allCustodians)).toEqual(['Cy Clerk']);
  });

  it('the custodian filters find the kept document for a custodian whose copy was suppressed', async () => {
    const custodians = (await lead.get(`/api/matters/${matter.id}/custodians`)).body.custodians as {
      id: number;
      name: string;
    }[];
    const ben = custodians.find((c) => c.name === 'Ben Baker')!;
    const listed = await list(`&custodian=${ben.id}&status=extracted`);
    expect(listed.map((d) => d.name).sort()).toEqual(['spec.eml', 'spec.pdf']);
    const res = await lead
      .post(`/api/matters/${matter.id}/search`)
      .send({ query: 'moisture', mode: 'keyword', filters: { custodianIds: [ben.id] } });
    expect(res.status).toBe(200);
    const hits = res.body.hits as { documentId: number }[];
    expect(hits.map((h) => h.documentId)).toContain(email.id);
    // Cy's own e-mail (about the same specification) is not Ben's.
    const filing = (await list()).find((d) => d.name === 'filing.eml')!;
    expect(hits.map((h) => h.documentId)).not.toContain(filing.id);
  });

  it('the results CSV carries the e-mail fields, the family and every custodian', async () => {
    const res = await lead
      .get(`/api/matters/${matter.id}/exports/results.csv`)
      .query({ query: 'moisture', mode: 'keyword' })
      .buffer(true)
      .parse(bytesBody);
    expect(res.status).toBe(200);
    const [header, ...rows] = parse(res.body as Buffer, { bom: true }) as string[][];
    const row = rows.find((r) => r[1] === email.controlNumber)!;
    const cell = (name: string) => row[header.indexOf(name)];
    expect(cell('From')).toBe('Ann Miller <ann@mill.example>');
    expect(cell('Cc')).toBe('Cy Clerk <cy@bakery.example>');
    expect(cell('Message-ID')).toBe('<spec-1@mill.example>');
    expect(cell('Family ID')).toBe(email.controlNumber);
    expect(cell('All custodians')).toBe('Ann Miller; Ben Baker');
  });
});

describe('threads and near-duplicates through the API', () => {
  it('a reply joins the thread (In-Reply-To) as a tree; a quoted message with an attachment the reply lacks stays inclusive; the inclusive-only filter', async () => {
    const reply = await makeEml({
      from: 'Ben Baker <ben@bakery.example>',
      to: ['Ann Miller <ann@mill.example>'],
      subject: 'Re: Flour specification',
      date: new Date('2022-03-02T08:00:00Z'),
      messageId: '<reply-1@bakery.example>',
      inReplyTo: '<spec-1@mill.example>',
      text: 'Agreed, we will test each delivery.\n\n> Please find the milling specification attached. Moisture limits apply from April.',
    });
    await upload([{ name: 'reply.eml', content: reply }], 'Ben Baker');
    const docs = await list();
    const first = docs.find((d) => d.name === 'spec.eml')!;
    const answer = docs.find((d) => d.name === 'reply.eml')!;
    expect(answer.threadId).toBe(first.id);
    // The first message carries an attachment the reply does not: it stays inclusive.
    expect(first.inclusive).toBe(true);
    expect(answer.inclusive).toBe(true);
    const thread = (await lead.get(`/api/matters/${matter.id}/documents/${answer.id}/thread`))
      .body as ThreadResponse;
    expect(thread.messages.map((m) => [m.id, m.depth])).toEqual([
      [first.id, 0],
      [answer.id, 1],
    ]);
    const inclusiveOnly = await list('&inclusiveOnly=true');
    expect(inclusiveOnly.some((d) => d.id === answer.id)).toBe(true);
    expect((await lead.get(`/api/matters/${matter.id}/documents?inclusiveOnly=maybe`)).status).toBe(
      400,
    );
  });

  it('a near-identical draft joins a group with its principal and a similarity; the lead may change the threshold', async () => {
    const words = Array.from({ length: 300 }, (_, i) => `clause${i}`).join(' ');
    const draft = words.replace('clause150', 'amended150');
    await upload(
      [
        { name: 'draft-1.txt', content: makeText(`Supply agreement. ${words}`) },
        { name: 'draft-2.txt', content: makeText(`Supply agreement. ${draft}`) },
      ],
      'Ann Miller',
    );
    const docs = await list();
    const one = docs.find((d) => d.name === 'draft-1.txt')!;
    const two = docs.find((d) => d.name === 'draft-2.txt')!;
    expect(one.nearDuplicateGroupId).not.toBeNull();
    expect(two.nearDuplicateGroupId).toBe(one.nearDuplicateGroupId);
    const group = (await lead.get(`/api/matters/${matter.id}/documents/${two.id}/near-duplicates`))
      .body as NearDuplicatesResponse;
    expect(group.threshold).toBe(0.8);
    expect(group.members).toHaveLength(2);
    // Exact shingle Jaccard: one changed word breaks 4 of 299 four-word shingles: 295/303.
    const other = group.members.find((m) => !m.principal)!;
    expect(Math.abs(other.similarity - 295 / 303)).toBeLessThanOrEqual(1 / Math.sqrt(128));
    expect((await list(`&nearDuplicateGroup=${group.groupId}`)).map((d) => d.id).sort()).toEqual(
      [one.id, two.id].sort(),
    );
    const bad = await lead
      .put(`/api/matters/${matter.id}/near-duplicates/settings`)
      .send({ threshold: 1.5 });
    expect(bad.status).toBe(400);
    const changed = await lead
      .put(`/api/matters/${matter.id}/near-duplicates/settings`)
      .send({ threshold: 1 });
    expect(changed.status).toBe(200);
    expect((await detail(two.id)).document.nearDuplicateGroupId).toBeNull();
  });
});
