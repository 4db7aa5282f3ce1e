import { spawn } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';

// The eval verb end to end, as a user runs it (`npm run quarry -- eval ...`), on a
// small invented collection written to a temporary folder.
const dir = mkdtempSync(join(tmpdir(), 'quarry-eval-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const file = (name: string, text: string) => {
  const path = join(dir, name);
  writeFileSync(path, text);
  return path;
};

const docs = file(
  'docs.jsonl',
  [
    {
      id: 'a',
      title: 'Wing lift',
      text: 'wing lift at high angles of attack in a propeller slipstream',
    },
    {
      id: 'b',
      title: 'Boundary layer',
      text: 'boundary layer transition on a flat plate at high speed',
    },
    {
      id: 'c',
      title: 'Heat transfer',
      text: 'heat transfer in the boundary layer of a hypersonic wing',
    },
    { id: 'd', title: 'Propeller', text: 'propeller slipstream effects on wing lift and drag' },
    { id: 'e', title: 'Drag', text: 'drag of a flat plate in hypersonic flow' },
  ]
    .map((d) => JSON.stringify(d))
    .join('\n'),
);
const queries = file(
  'queries.jsonl',
  [
    '{"id":"1","text":"wing lift slipstream"}',
    '{"id":"2","text":"boundary layer heat"}',
    '{"id":"3","text":"zebra quokka"}',
  ].join('\n'),
);
const qrels = file('qrels.txt', '1 0 a 2\n1 0 d 1\n2 0 b 1\n2 0 c 2\n3 0 a 1\n');

function quarry(
  ...args: string[]
): Promise<{ status: number | null; stdout: string; stderr: string }> {
  return new Promise((resolve, reject) => {
    const child = spawn(
      process.execPath,
      ['--import', 'tsx', 'server/cli/quarry.ts', 'eval', ...args],
      {
        cwd: process.cwd(),
        timeout: 60_000,
      },
    );
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (chunk) => (stdout += chunk));
    child.stderr.on('data', (chunk) => (stderr += chunk));
    child.on('error', reject);
    child.on('close', (status) => resolve({ status, stdout, stderr }));
  });
}

const base = ['--docs', docs, '--queries', queries, '--qrels', qrels];

// Each case spawns a process; they run concurrently (2-3 at a time) to keep the file fast.
describe.concurrent('quarry eval', () => {
  for (const mode of ['concept', 'keyword', 'hybrid']) {
    it(`--mode ${mode} --json prints one object with the measures`, async () => {
      const run = await quarry(...base, '--mode', mode, '--json');
      expect(run.status, run.stderr).toBe(0);
      const out = JSON.parse(run.stdout);
      expect(out).toMatchObject({ mode, queries: 3 });
      for (const key of ['map', 'p10', 'rprec', 'ndcg10', 'build_ms']) {
        expect(typeof out[key]).toBe('number');
        expect(out[key]).toBeGreaterThanOrEqual(0);
      }
      expect('k' in out).toBe(true);
      // Query 3 shares no term with the corpus: an empty result and a notice, no stack trace.
      expect(run.stderr).toMatch(/query 3: no/);
      expect(run.stderr).not.toMatch(/\n\s+at /);
      // Query 1's relevant a and d both contain "wing lift slipstream": AP > 0.
      expect(out.map).toBeGreaterThan(0.3);
    });
  }

  it('prints a readable table without --json', async () => {
    const run = await quarry(...base, '--mode', 'concept', '--k', '2');
    expect(run.status, run.stderr).toBe(0);
    expect(run.stdout).toMatch(/MAP\s+\d\.\d{4}/);
    expect(run.stdout).toMatch(/nDCG@10/);
    expect(run.stdout).toMatch(/k = 2/);
  });

  const bad: [string, string[], RegExp][] = [
    [
      'a missing file',
      [
        '--docs',
        join(dir, 'nope.jsonl'),
        '--queries',
        queries,
        '--qrels',
        qrels,
        '--mode',
        'concept',
      ],
      /nope\.jsonl: no such file/,
    ],
    [
      'a malformed line',
      [
        '--docs',
        file('bad.jsonl', '{"id":"a","text":"x"}\n{"id":'),
        '--queries',
        queries,
        '--qrels',
        qrels,
        '--mode',
        'concept',
      ],
      /bad\.jsonl:2: not valid JSON/,
    ],
    ['k = 0', [...base, '--mode', 'concept', '--k', '0'], /--k must be a whole number above 0/],
    ['k above the rank', [...base, '--mode', 'concept', '--k', '500'], /k = 500 is above the rank/],
    [
      'an empty corpus',
      [
        '--docs',
        file('empty.jsonl', ''),
        '--queries',
        queries,
        '--qrels',
        qrels,
        '--mode',
        'keyword',
      ],
      /empty corpus/,
    ],
    ['an unknown mode', [...base, '--mode', 'psychic'], /--mode must be one of/],
    [
      'a malformed qrels line',
      [
        '--docs',
        docs,
        '--queries',
        queries,
        '--qrels',
        file('bad-qrels.txt', '1 0 a\n'),
        '--mode',
        'keyword',
      ],
      /bad-qrels\.txt:1:/,
    ],
  ];
  for (const [what, args, message] of bad) {
    it(`refuses ${what} with one line and a non-zero exit`, async () => {
      const run = await quarry(...args);
      expect(run.status).not.toBe(0);
      expect(run.stderr).toMatch(message);
      expect(run.stderr.trim().split('\n')).toHaveLength(1);
      expect(run.stdout).toBe('');
    });
  }
});
