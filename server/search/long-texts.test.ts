// A result page of long e-mails: snippets and "why it matched" read a bounded window
// of each text (HIT_WINDOW_CHARS), so three hits of 6-12 MB cost about what short ones
// cost. Measured as the event loop's largest delay (perf_hooks.monitorEventLoopDelay)
// while the search runs; before the window each such hit was analysed whole, about
// 2.7 s of main-thread time per 12 MB text on this machine. The memo titles are those
// of Deerwester et al. (1990), Table 1 (test-fixture.ts).
import { cpus, loadavg } from 'node:os';
import { monitorEventLoopDelay } from 'node:perf_hooks';
import { afterAll, beforeAll, expect, test } from 'vitest';
import type { SearchResponse } from '../../shared/schemas/search';
import { createTestApp, type Agent, type TestApp } from '../../tests/helpers';
import { HIT_WINDOW_CHARS } from './highlight';
import { buildMemoMatter, DEERWESTER_TITLES, type MemoMatter } from './test-fixture';

let t: TestApp;
let m: MemoMatter;
let lead: Agent;

/** A long text: the memo's title, then a filler paragraph (accented, so not plain ASCII). */
function longText(title: string, megabytes: number): string {
  const filler = ' Le café du coin a reçu la livraison de farine humide, déjà signalée.';
  return title + filler.repeat(Math.ceil((megabytes * 1024 * 1024) / filler.length));
}

beforeAll(async () => {
  t = await createTestApp();
  m = await buildMemoMatter(t);
  lead = await t.agentFor(m.matter.lead);
  const sizes = { c1: 6, c2: 9, c4: 12 } as const;
  for (const [key, mb] of Object.entries(sizes) as [keyof typeof sizes, number][])
    await t.ctx.db
      .updateTable('document_texts')
      .set({ body: longText(DEERWESTER_TITLES[key], mb) })
      .where('document_id', '=', m.ids[key])
      .execute();
  // The keyword index takes the new texts in on the first search (once per change).
  const warm = await lead
    .post(`/api/matters/${m.matter.id}/search`)
    .send({ query: 'survey', mode: 'keyword' });
  expect(warm.status).toBe(200);
}, 60_000);
afterAll(() => t?.close());

test('a page holding three 6-12 MB texts is served from bounded windows', async () => {
  const histogram = monitorEventLoopDelay({ resolution: 10 });
  histogram.enable();
  const res = await lead
    .post(`/api/matters/${m.matter.id}/search`)
    .send({ query: 'human computer interaction', mode: 'hybrid' });
  histogram.disable();
  expect(res.status).toBe(200);
  const body = res.body as SearchResponse;
  const long = body.hits.filter((h) => [m.ids.c1, m.ids.c2, m.ids.c4].includes(h.documentId));
  expect(long).toHaveLength(3);
  for (const hit of long) {
    // The query's words are marked in the snippet, which says the text goes on.
    expect(hit.snippet.some((s) => s.mark === 'query')).toBe(true);
    expect(hit.snippet.at(-1)?.text.endsWith(' …')).toBe(true);
    expect(hit.snippet.reduce((n, s) => n + s.text.length, 0)).toBeLessThan(HIT_WINDOW_CHARS);
    expect(hit.why.topTerms.length).toBeGreaterThan(0);
  }
  // Generous for a loaded 2-core machine (and more so when its load average exceeds twice
  // its cores); whole-text analysis took seconds per hit.
  const maxMs = histogram.max / 1e6;
  console.log(
    `long texts: event loop max delay ${maxMs.toFixed(0)} ms (load average ${loadavg()[0].toFixed(1)})`,
  );
  expect(maxMs).toBeLessThan(loadavg()[0] > 2 * cpus().length ? 3000 : 600);
}, 60_000);
