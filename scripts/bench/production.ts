// `npm run bench:production [-- --docs 1000]`: builds a production of a synthetic matter
// (invented text; mixed types: 3-page PDFs, e-mails, Word-like text, spreadsheets that
// travel as natives; 10% redacted, half of those PDFs burned in by rasterising) through
// the same service and job the API runs, and writes the "Production build" section of
// docs/PERFORMANCE.md. A script that writes a report, not a test.
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { cpus, loadavg, tmpdir } from 'node:os';
import path from 'node:path';
import { parseArgs } from 'node:util';
import { makePdf } from '../../corpus-demo/render';
import { loadConfig } from '../../server/config';
import { createContext } from '../../server/context';
import { mulberry32 } from '../../server/engine/index';
import { createProduction, requestBuild } from '../../server/productions/service';

const { values } = parseArgs({ options: { docs: { type: 'string', default: '1000' } } });
const N = Number(values.docs);
const WORDS =
  'supply delivery flour mill invoice schedule quality complaint moisture contract clause notice payment credit board minutes report tonnes'.split(
    ' ',
  );

function paragraph(rand: () => number, words: number) {
  const out: string[] = [];
  for (let i = 0; i < words; i++) out.push(WORDS[Math.floor(rand() * WORDS.length)]);
  return `${out.join(' ')}.`;
}

async function main() {
  const dir = mkdtempSync(path.join(tmpdir(), 'quarry-bench-production-'));
  const config = loadConfig({ QUARRY_DATA_DIR: dir, QUARRY_LOG_LEVEL: 'error' });
  const ctx = await createContext(config);
  const rand = mulberry32(20261204);
  try {
    const user = 'bench-lead';
    const now = new Date().toISOString();
    await ctx.db
      .insertInto('users')
      .values({
        id: user,
        email: 'bench@quarry.example',
        name: 'Bench Lead',
        password_hash: 'x',
        is_admin: 0,
        disabled_at: null,
        password_changed_at: now,
        created_at: now,
      })
      .execute();
    const matter = await ctx.db
      .insertInto('matters')
      .values({ name: 'Production bench', control_prefix: 'PB', created_by: user, created_at: now })
      .returning('id')
      .executeTakeFirstOrThrow();
    const code = await ctx.db
      .insertInto('codes')
      .values({
        matter_id: matter.id,
        name: 'Responsive',
        shortcut: '1',
        marks_privileged: 0,
        archived_at: null,
        created_at: now,
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    const pdfTemplates: { pdf: Buffer; text: string }[] = [];
    for (let i = 0; i < 8; i++) {
      const pages = [0, 1, 2].map(() => paragraph(rand, 350) + ` Account 4412-7781-00${10 + i}.`);
      pdfTemplates.push({
        pdf: await makePdf({ title: `Report ${i}`, author: 'Bench', pages }),
        text: pages.join('\n\n'),
      });
    }
    const kinds = { pdf: 0, email: 0, text: 0, sheet: 0 };
    let redacted = 0;
    const loadStarted = performance.now();
    for (let i = 0; i < N; i++) {
      const r = i % 10;
      const kind = r < 4 ? 'pdf' : r < 7 ? 'email' : r < 9 ? 'text' : 'sheet';
      kinds[kind] += 1;
      const body =
        kind === 'pdf'
          ? ''
          : kind === 'sheet'
            ? 'week,tonnes\n1,40\n2,55\n'
            : Array.from({ length: 18 }, () => paragraph(rand, 60)).join('\n\n') +
              ' Account 4412-7781-0093.';
      const blob =
        kind === 'pdf'
          ? await ctx.blobs.putBuffer(pdfTemplates[i % 8].pdf)
          : await ctx.blobs.putBuffer(Buffer.from(`${i}\n${body}`));
      const mime = {
        pdf: 'application/pdf',
        email: 'message/rfc822',
        text: 'text/plain',
        sheet: 'text/csv',
      }[kind];
      const doc = await ctx.db
        .insertInto('documents')
        .values({
          matter_id: matter.id,
          batch_id: null,
          custodian_id: null,
          parent_id: null,
          control_number: `PB-${String(i + 1).padStart(6, '0')}`,
          original_name: `doc-${i}.${{ pdf: 'pdf', email: 'eml', text: 'txt', sheet: 'csv' }[kind]}`,
          sha256: blob.sha256,
          mime,
          size: blob.size,
          title: `Document ${i}`,
          email_from: kind === 'email' ? 'Ann Reed <ann@mill.example>' : '',
          email_to: kind === 'email' ? 'Bo Lane <bo@bakery.example>' : '',
          sent_at: '2021-03-02T10:00:00.000Z',
          page_count: kind === 'pdf' ? 3 : null,
          extract_status: 'extracted',
          extract_error: null,
          duplicate_of: null,
          created_at: now,
        })
        .returning('id')
        .executeTakeFirstOrThrow();
      const text = kind === 'pdf' ? pdfTemplates[i % 8].text : body;
      await ctx.db
        .insertInto('document_texts')
        .values({ document_id: doc.id, title: `Document ${i}`, body: text })
        .execute();
      await ctx.db
        .insertInto('document_codes')
        .values({ document_id: doc.id, code_id: code.id, coded_by: user, coded_at: now })
        .execute();
      if (i % 10 === 3 || i % 10 === 5) {
        redacted += 1;
        await ctx.db
          .insertInto('redactions')
          .values({
            matter_id: matter.id,
            document_id: doc.id,
            kind: 'pattern',
            pattern: '####-####-####',
            pattern_kind: 'format',
            reason: 'Personal data',
            created_by: user,
            created_at: now,
          })
          .execute();
      }
    }
    const loadMs = performance.now() - loadStarted;
    const actor = { id: user, email: 'bench@quarry.example', ip: null };
    const { production } = await createProduction(
      ctx,
      matter.id,
      {
        name: 'Bench',
        source: { codes: [code.id] },
        bates: { prefix: 'PB', padding: 7 },
        legend: 'CONFIDENTIAL',
        privileged: 'withhold',
      },
      actor,
    );
    const loadBefore = loadavg();
    const started = performance.now();
    await requestBuild(ctx, matter.id, production.id, actor);
    await ctx.jobs.waitForIdle(60 * 60 * 1000);
    const buildMs = performance.now() - started;
    const loadAfter = loadavg();
    const row = await ctx.db
      .selectFrom('productions')
      .selectAll()
      .where('id', '=', production.id)
      .executeTakeFirstOrThrow();
    if (row.state !== 'built') throw new Error(`the build ended ${row.state}: ${row.error}`);
    const loads = (l: number[]) => l.map((x) => x.toFixed(1)).join(' / ');
    const section = [
      '## Production build',
      '',
      `\`npm run bench:production\` (scripts/bench/production.ts), ${new Date().toISOString().slice(0, 10)}: a production of ${N.toLocaleString('en')} documents`,
      `(${kinds.pdf} three-page PDFs kept page for page, ${kinds.email} e-mails and ${kinds.text} text documents laid out from their text,`,
      `${kinds.sheet} spreadsheets with a placeholder page and their native; ${redacted} redacted with a format mask, of which`,
      `${Math.round(redacted / 2)} PDFs rasterised with the redactions painted into the pixels) built through the same service and`,
      '`build-production` job the API runs: page rendering in its worker thread, Bates stamps and legend on every page,',
      'the zip with PDF, TEXT, NATIVES, DATA/metadata.csv and manifest.json.',
      '',
      `| Documents | Pages | Build time (s) | Documents per second | Zip size (MB) |`,
      '| ---: | ---: | ---: | ---: | ---: |',
      `| ${N.toLocaleString('en')} | ${row.pages?.toLocaleString('en')} | ${(buildMs / 1000).toFixed(1)} | ${(N / (buildMs / 1000)).toFixed(1)} | ${((row.zip_size ?? 0) / 1e6).toFixed(1)} |`,
      '',
      `Machine: ${cpus().length} cores (${cpus()[0]?.model ?? 'unknown'}), load average (1 / 5 / 15 min) ${loads(loadBefore)} when the build began and ${loads(loadAfter)} at the end${loadBefore[0] > 1.5 ? ': other work was sharing the machine, and the time is inflated accordingly' : ''}.`,
      `Target: a 1,000-document production in under 2 minutes on this 2-core machine. ${N >= 1000 ? (buildMs < 120_000 ? 'Met' : 'Not met') + ' on this run.' : 'This was a smaller run than the target.'}`,
      `(Loading the synthetic matter took ${(loadMs / 1000).toFixed(0)} s and is not part of the figure.)`,
      '',
    ].join('\n');
    console.log(section);
    const file = 'docs/PERFORMANCE.md';
    const existing = existsSync(file) ? readFileSync(file, 'utf8') : '# Performance\n';
    const re = /## Production build\n[\s\S]*?(?=\n## |$)/;
    const next = re.test(existing)
      ? existing.replace(re, section)
      : `${existing.trimEnd()}\n\n${section}`;
    writeFileSync(file, next.endsWith('\n') ? next : `${next}\n`);
  } finally {
    await ctx.close();
    rmSync(dir, { recursive: true, force: true });
  }
}

await main();
