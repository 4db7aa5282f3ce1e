// The audit trail as CSV (issue 18): parsed back with csv-parse (RFC 4180) and compared
// with the JSON trail the screen reads; a day range keeps only that range's events.
import { parse } from 'csv-parse/sync';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { AUDIT_CSV_COLUMNS, type AuditEvent } from '../../shared/schemas/audit';
import { createTestApp, type Agent, type TestApp, bytesBody } from '../../tests/helpers';
import { buildMemoMatter, type MemoMatter } from '../search/test-fixture';

let t: TestApp;
let m: MemoMatter;
let base: string;
let lead: Agent;

async function download(agent: Agent, path: string, query: Record<string, string> = {}) {
  const res = await agent.get(path).query(query).buffer(true).parse(bytesBody);
  return { res, rows: parse(res.body as Buffer, { bom: true }) as string[][] };
}

async function allEvents(): Promise<AuditEvent[]> {
  const events: AuditEvent[] = [];
  let before: number | null = null;
  for (;;) {
    const page = await lead
      .get(`${base}/audit`)
      .query({ limit: 200, ...(before ? { before } : {}) });
    expect(page.status).toBe(200);
    events.push(...(page.body.events as AuditEvent[]));
    before = page.body.nextCursor;
    if (before === null) return events;
  }
}

beforeAll(async () => {
  t = await createTestApp();
  m = await buildMemoMatter(t);
  base = `/api/matters/${m.matter.id}`;
  lead = await t.agentFor(m.matter.lead);
  // Two events on known days, with a control number and a comma in their details.
  for (const [at, note] of [
    ['2026-03-02T09:15:00.000Z', 'first look, then coded'],
    ['2026-03-04T23:59:59.000Z', 'late "second" look'],
  ] as const)
    await t.ctx.db
      .insertInto('audit_events')
      .values({
        at,
        actor_id: m.matter.lead.id,
        actor_email: m.matter.lead.email,
        matter_id: m.matter.id,
        action: 'note.added',
        target_type: 'document',
        target_id: String(m.ids.c1),
        detail: JSON.stringify({ controlNumber: 'MEMO-000001', note }),
        ip: '127.0.0.1',
      })
      .execute();
});

afterAll(async () => {
  await t?.close();
});

describe('audit.csv', () => {
  test('holds every event of the trail, newest first, in readable columns', async () => {
    const events = await allEvents();
    const { res, rows } = await download(lead, `${base}/audit.csv`);
    expect(res.status).toBe(200);
    expect(res.headers['content-disposition']).toMatch(
      /attachment; filename="matter-\d+-audit-\d{4}-\d{2}-\d{2}\.csv"/,
    );
    const [header, ...body] = rows;
    expect(header).toEqual([...AUDIT_CSV_COLUMNS]);
    expect(body.map((r) => r[0])).toEqual(events.map((e) => e.at));
    expect(body.map((r) => r[3])).toEqual(events.map((e) => e.action));
    const late = body.find((r) => r[8].includes('late'))!;
    expect(late).toEqual([
      '2026-03-04T23:59:59.000Z',
      m.matter.lead.name,
      m.matter.lead.email,
      'note.added',
      'Added a note',
      'document',
      String(m.ids.c1),
      'MEMO-000001',
      'note: late "second" look',
      '127.0.0.1',
    ]);
  });

  test('keeps a day range, both days included, and is itself audited', async () => {
    const { res, rows } = await download(lead, `${base}/audit.csv`, {
      from: '2026-03-02',
      to: '2026-03-04',
    });
    expect(res.status).toBe(200);
    expect(rows.slice(1).map((r) => r[0])).toEqual([
      '2026-03-04T23:59:59.000Z',
      '2026-03-02T09:15:00.000Z',
    ]);
    // The screen's JSON trail takes the same range.
    const page = await lead.get(`${base}/audit`).query({ from: '2026-03-02', to: '2026-03-04' });
    expect((page.body.events as AuditEvent[]).map((e) => e.at)).toEqual([
      '2026-03-04T23:59:59.000Z',
      '2026-03-02T09:15:00.000Z',
    ]);
    const exported = await t.ctx.db
      .selectFrom('audit_events')
      .select('detail')
      .where('action', '=', 'export.audit')
      .where('matter_id', '=', m.matter.id)
      .orderBy('id', 'desc')
      .executeTakeFirstOrThrow();
    expect(JSON.parse(exported.detail)).toEqual({ rows: 2, from: '2026-03-02', to: '2026-03-04' });
  });

  test('refuses a range that is not one, naming the field', async () => {
    const backwards = await lead
      .get(`${base}/audit.csv`)
      .query({ from: '2026-03-05', to: '2026-03-01' });
    expect(backwards.status).toBe(400);
    expect(backwards.body.error.message).toContain('to: must not be before from');
    const badDay = await lead.get(`${base}/audit.csv`).query({ from: '2026-02-30' });
    expect(badDay.status).toBe(400);
    expect(badDay.body.error.message).toContain('from:');
  });
});
