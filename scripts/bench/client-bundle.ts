// `node --import tsx scripts/bench/client-bundle.ts`: builds the client (Vite, with its
// manifest) into a temporary folder and reports the JavaScript, gzipped, that the first
// screens load: the entry chunk plus every chunk the page's module imports statically
// (chunks behind a dynamic import() are fetched only when used). Writes
// scripts/bench/client-bundle.json. src/app/route-chunks.test.ts holds the budget.

import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { build } from 'vite';

const root = join(import.meta.dirname, '..', '..');

/** The screens measured: a name and the route module React Router loads for it. */
export const FIRST_SCREENS = {
  'sign-in': 'src/app/routes/sign-in.tsx',
  'matter list': 'src/app/routes/matters.tsx',
} as const;

type ManifestChunk = { file: string; imports?: string[]; isEntry?: boolean };

export type ScreenBundle = { files: string[]; gzipBytes: number };

export async function measureFirstScreens(): Promise<Record<string, ScreenBundle>> {
  const outDir = mkdtempSync(join(tmpdir(), 'quarry-bundle-'));
  try {
    await build({
      root,
      configFile: join(root, 'vite.config.ts'),
      logLevel: 'silent',
      build: { outDir, emptyOutDir: true, manifest: 'manifest.json' },
    });
    const manifest = JSON.parse(readFileSync(join(outDir, 'manifest.json'), 'utf8')) as Record<
      string,
      ManifestChunk
    >;
    const entry = Object.keys(manifest).find((key) => manifest[key].isEntry);
    if (!entry) throw new Error('the Vite manifest has no entry chunk');
    const closure = (keys: string[]) => {
      const seen = new Set<string>();
      const visit = (key: string) => {
        if (seen.has(key)) return;
        const chunk = manifest[key];
        if (!chunk) throw new Error(`the Vite manifest has no chunk ${key}`);
        seen.add(key);
        for (const next of chunk.imports ?? []) visit(next);
      };
      keys.forEach(visit);
      return [...seen].map((key) => manifest[key].file).filter((file) => file.endsWith('.js'));
    };
    const result: Record<string, ScreenBundle> = {};
    for (const [screen, module] of Object.entries(FIRST_SCREENS)) {
      const files = closure([entry, module]).sort();
      const gzipBytes = files.reduce(
        (sum, file) => sum + gzipSync(readFileSync(join(outDir, file))).length,
        0,
      );
      result[screen] = { files, gzipBytes };
    }
    return result;
  } finally {
    rmSync(outDir, { recursive: true, force: true });
  }
}

if (process.argv[1]?.endsWith('client-bundle.ts')) {
  const screens = await measureFirstScreens();
  const report = Object.fromEntries(
    Object.entries(screens).map(([screen, { files, gzipBytes }]) => [
      screen,
      { gzipKB: Math.round(gzipBytes / 10.24) / 100, chunks: files.length },
    ]),
  );
  writeFileSync(
    join(import.meta.dirname, 'client-bundle.json'),
    `${JSON.stringify({ measuredAt: new Date().toISOString(), screens: report }, null, 2)}\n`,
  );
  console.table(report);
}
