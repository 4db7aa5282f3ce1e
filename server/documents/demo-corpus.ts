// The demo seed's corpus step: generate the invented matter's files (corpus-demo/) into
// <dataDir>/demo-corpus and load them into the demo matter, one batch per custodian
// folder. Extraction and the first index build then run as ordinary background jobs.
import path from 'node:path';
import { generateDemoCorpus } from '../../corpus-demo/generate';
import type { AppContext } from '../context';
import { listFolder, loadFiles } from './ingest';

/**
 * QUARRY_SEED_CORPUS=0 skips the corpus, =1 forces it; unset, it loads except under Vitest
 * (so seeding in tests stays fast unless a test asks for the corpus).
 */
export function seedCorpusEnabled(env: NodeJS.ProcessEnv = process.env): boolean {
  const flag = env.QUARRY_SEED_CORPUS;
  if (flag === '0' || flag === 'false') return false;
  if (flag === '1' || flag === 'true') return true;
  return !env.VITEST;
}

export async function loadDemoCorpus(
  ctx: AppContext,
  matterId: number,
  actor: { id: string | null; email: string | null },
): Promise<void> {
  const started = Date.now();
  const outDir = path.join(ctx.config.dataDir, 'demo-corpus');
  const manifest = await generateDemoCorpus(outDir);
  ctx.logger.info({ files: manifest.documentCount, outDir }, 'demo corpus generated');
  const files = (await listFolder(outDir)).filter((f) => f.relativePath.includes('/'));
  const bySlug = new Map(manifest.custodians.map((c) => [c.slug, c.name]));
  const folders = [...new Set(files.map((f) => f.relativePath.split('/')[0]))];
  for (const folder of folders) {
    const batch = await loadFiles(
      ctx,
      files.filter((f) => f.relativePath.split('/')[0] === folder),
      {
        matterId,
        custodianName: bySlug.get(folder) ?? folder,
        source: 'demo',
        actor: { ...actor, ip: null },
      },
    );
    ctx.logger.info(
      { custodian: batch.custodian?.name, files: batch.files.length },
      'demo corpus: custodian loaded; extraction queued',
    );
  }
  ctx.logger.info(
    { ms: Date.now() - started },
    'demo corpus loaded; extraction and indexing run in the background',
  );
}
