// OCR of scans and images with Debian's tesseract-ocr; PDF pages are rendered first with
// poppler-utils' pdftoppm. Each page runs as a child process with its own time limit, so
// a page that hangs is killed without taking the worker with it.
import { execFile } from 'node:child_process';
import { mkdtemp, readdir, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { Refused, tidyText, blank, type Fields } from './fields';
import type { ExtractLimits } from './types';

/** Called before a step that may take up to `ms` (one OCR page), so timers can allow it. */
export type LongStep = (ms: number) => void;

/** 300 dpi: Tesseract's documentation recommends at least 300 dpi for reliable results. */
const RENDER_DPI = 300;

interface RunResult {
  stdout: string;
  timedOut: boolean;
  missing: boolean;
  failed: boolean;
}

function run(command: string, args: string[], timeoutMs: number): Promise<RunResult> {
  return new Promise((resolve) => {
    execFile(
      command,
      args,
      {
        timeout: timeoutMs,
        killSignal: 'SIGKILL',
        maxBuffer: 64 * 1024 * 1024,
        encoding: 'utf8',
        // One thread per page: tesseract's OpenMP threads slow it down on a shared 2-core
        // machine (tesseract's documentation advises OMP_THREAD_LIMIT=1 when running jobs side by side).
        env: { ...process.env, OMP_THREAD_LIMIT: '1' },
      },
      (error, stdout) => {
        const code = (error as NodeJS.ErrnoException | null)?.code;
        resolve({
          stdout: stdout ?? '',
          timedOut: Boolean(error && (error as { killed?: boolean }).killed),
          missing: code === 'ENOENT',
          failed: Boolean(error),
        });
      },
    );
  });
}

/** Text of one image file (PNG, JPEG, TIFF; every page of a multi-page TIFF). */
async function tesseract(imagePath: string, limits: ExtractLimits): Promise<string> {
  // --psm 3: fully automatic page segmentation (the default, stated for clarity).
  const result = await run(
    'tesseract',
    [imagePath, 'stdout', '-l', 'eng', '--psm', '3'],
    limits.ocrPageTimeoutMs,
  );
  if (result.missing) throw new Refused('OCR is not available on this server');
  if (result.timedOut) throw new Refused('OCR timed out on a page');
  if (result.failed) throw new Refused('file could not be read');
  return result.stdout;
}

// OCR reads stray marks (a stamp, a rule) as single characters: a page counts as text when it
// holds a run of at least two letters or digits.
const hasWords = (text: string) => /[\p{L}\p{N}]{2,}/u.test(text);

export async function ocrImage(
  filePath: string,
  limits: ExtractLimits,
  onLongStep: LongStep,
): Promise<Fields> {
  onLongStep(limits.ocrPageTimeoutMs);
  const text = tidyText(await tesseract(filePath, limits));
  if (!hasWords(text)) throw new Refused('OCR found no text');
  const fields = blank();
  fields.text = text;
  fields.ocr = true;
  fields.pageCount = 1;
  return fields;
}

/** Renders each page of a PDF (pdftoppm) and reads it (tesseract); pages joined by blank lines. */
export async function ocrPdf(
  filePath: string,
  pageCount: number,
  limits: ExtractLimits,
  password: string | undefined,
  onLongStep: LongStep,
): Promise<string> {
  if (pageCount > limits.ocrMaxPages) throw new Refused('too many pages to OCR');
  const dir = await mkdtemp(path.join(os.tmpdir(), 'quarry-ocr-'));
  try {
    const pages: string[] = [];
    for (let page = 1; page <= pageCount; page += 1) {
      onLongStep(limits.ocrPageTimeoutMs * 2);
      const prefix = path.join(dir, `p${page}`);
      // The password goes as an argument to a local child process only; it is never logged.
      const args = [
        '-r',
        String(RENDER_DPI),
        '-gray',
        '-png',
        '-f',
        String(page),
        '-l',
        String(page),
      ];
      if (password !== undefined) args.push('-upw', password);
      const rendered = await run('pdftoppm', [...args, filePath, prefix], limits.ocrPageTimeoutMs);
      if (rendered.missing) throw new Refused('OCR is not available on this server');
      if (rendered.timedOut) throw new Refused('OCR timed out on a page');
      if (rendered.failed) throw new Refused('not a valid PDF');
      const image = (await readdir(dir)).find((name) => name.startsWith(`p${page}-`));
      if (!image) throw new Refused('not a valid PDF');
      pages.push(tidyText(await tesseract(path.join(dir, image), limits)));
      await rm(path.join(dir, image), { force: true });
    }
    const text = tidyText(pages.join('\n\n'));
    if (!hasWords(text)) throw new Refused('OCR found no text');
    return text;
  } finally {
    await rm(dir, { recursive: true, force: true });
  }
}
