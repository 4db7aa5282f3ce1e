// `npm run quarry -- import --matter "<name>" [--create --lead <email> [--prefix ABC]]
// [--custodian "<name>"] <folder>`: loads a folder tree into a matter through the same
// service the upload route uses, then runs extraction and indexing to completion, with a
// progress bar in the terminal. With --create the matter is made first (same checks and
// audit records as the admin screen), so a bulk load needs no web screens.
import { stat } from 'node:fs/promises';
import path from 'node:path';
import cliProgress from 'cli-progress';
import { loadConfig } from '../../config';
import { createContext } from '../../context';
import { createMatterSchema } from '../../../shared/schemas/matters';
import { findMatterByName } from '../../documents/queries';
import { createMatter } from '../../matters/service';
import { listFolder, loadFiles } from '../../documents/ingest';
import { HttpError } from '../../http/errors';
import { parseCommandArgs } from '../args';
import { CliError } from '../cli-error';

export async function run(argv: string[]): Promise<void> {
  const { values, positionals } = parseCommandArgs(
    argv,
    {
      matter: { type: 'string' },
      custodian: { type: 'string' },
      create: { type: 'boolean' },
      lead: { type: 'string' },
      prefix: { type: 'string' },
    },
    true,
  );
  if (!values.matter) throw new CliError('--matter "<name>" is required');
  if (values.create && !values.lead)
    throw new CliError('--create needs --lead <email> (the account that leads the new matter)');
  if (!values.create && (values.lead || values.prefix))
    throw new CliError('--lead and --prefix only go with --create');
  if (positionals.length !== 1) throw new CliError('give exactly one folder to import');
  const folder = path.resolve(positionals[0]);
  const info = await stat(folder).catch(() => null);
  if (!info?.isDirectory()) throw new CliError(`${positionals[0]} is not a folder`);

  const config = loadConfig({ QUARRY_LOG_LEVEL: 'warn', ...process.env });
  const ctx = await createContext(config);
  const interactive = Boolean(process.stderr.isTTY);
  const bar = new cliProgress.SingleBar(
    {
      format: '{phase} [{bar}] {value}/{total} {detail}',
      hideCursor: true,
      noTTYOutput: !interactive,
    },
    cliProgress.Presets.shades_classic,
  );
  try {
    const actor = { id: null, email: `cli:${process.env.USER ?? 'unknown'}`, ip: null };
    if (values.create) await createFromCli(ctx, values.matter, values.lead!, values.prefix, actor);
    const matter = await findMatterByName(ctx.db, values.matter);
    if (!matter)
      throw new CliError(
        `no matter is named "${values.matter}" (add --create --lead <email> to make it)`,
      );
    const files = await listFolder(folder);
    if (files.length === 0) throw new CliError(`${positionals[0]} holds no files`);
    bar.start(files.length, 0, { phase: 'Storing   ', detail: '' });
    let batch;
    try {
      batch = await loadFiles(ctx, files, {
        matterId: matter.id,
        custodianName: values.custodian ?? null,
        source: 'import',
        actor,
        onFileStored: (done, total) => {
          bar.setTotal(total);
          bar.update(done);
        },
      });
    } catch (error) {
      if (error instanceof HttpError) throw new CliError(error.message);
      throw error;
    }
    bar.update({ phase: 'Extracting', detail: '' });
    // Follow the jobs (extraction, then index build) until the queue is empty.
    const poll = setInterval(() => {
      void ctx.db
        .selectFrom('jobs')
        .select(['kind', 'progress', 'total', 'message'])
        .where('matter_id', '=', matter.id)
        .where('status', '=', 'running')
        .executeTakeFirst()
        .then((job) => {
          if (!job) return;
          bar.setTotal(Math.max(job.total, 1));
          bar.update(job.progress, {
            phase: job.kind === 'build-index' ? 'Indexing  ' : 'Extracting',
            detail: job.message.slice(0, 60),
          });
        });
    }, 250);
    try {
      await ctx.jobs.waitForIdle(30 * 60 * 1000);
    } finally {
      clearInterval(poll);
    }
    bar.stop();
    const docs = await ctx.db
      .selectFrom('documents')
      .select(['extract_status'])
      .where('batch_id', '=', batch.id)
      .execute();
    const count = (status: string) => docs.filter((d) => d.extract_status === status).length;
    const failedJob = await ctx.db
      .selectFrom('jobs')
      .select(['kind', 'error'])
      .where('matter_id', '=', matter.id)
      .where('status', '=', 'failed')
      .where('created_at', '>=', new Date(Date.now() - 60 * 60 * 1000).toISOString())
      .orderBy('id', 'desc')
      .executeTakeFirst();
    console.log(
      `Imported ${files.length} file(s) into "${matter.name}" as batch ${batch.id}: ` +
        `${count('extracted')} extracted, ${count('duplicate')} duplicate(s), ${count('failed')} failed` +
        (batch.skipped.length ? `, ${batch.skipped.length} archive entr(ies) skipped` : '') +
        (batch.files.length
          ? ` (${batch.files[0].controlNumber} to ${batch.files.at(-1)!.controlNumber})`
          : ''),
    );
    const space = await ctx.index.getIndex(matter.id);
    if (space)
      console.log(
        `Index version ${space.version}: ${space.space.nDocs} documents, k = ${space.space.k}`,
      );
    if (failedJob?.kind === 'build-index')
      throw new CliError(`the index build failed: ${failedJob.error}`);
  } finally {
    bar.stop();
    await ctx.close();
  }
}

/** Initials of the name's words (letters and digits), 2 to 8, starting with a letter: "BBVHM". */
export function prefixFromName(name: string): string {
  const initials = (name.match(/[\p{L}\p{N}]+/gu) ?? [])
    .map((w) => w[0])
    .join('')
    .normalize('NFD')
    .replace(/[^A-Za-z0-9]/g, '')
    .toUpperCase()
    .replace(/^[0-9]+/, '');
  const padded = initials.length >= 2 ? initials : `${initials}MATTER`.slice(0, 3);
  return padded.slice(0, 8);
}

async function createFromCli(
  ctx: Awaited<ReturnType<typeof createContext>>,
  name: string,
  lead: string,
  prefix: string | undefined,
  actor: { id: null; email: string; ip: null },
): Promise<void> {
  const parsed = createMatterSchema.safeParse({
    name,
    controlPrefix: prefix ?? prefixFromName(name),
    lead,
  });
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const field = issue.path[0] === 'controlPrefix' ? '--prefix' : `--${String(issue.path[0])}`;
    throw new CliError(`${field} ${issue.message}`);
  }
  try {
    const created = await createMatter(ctx.db, parsed.data, actor);
    console.log(
      `Created matter "${created.name}" (control prefix ${created.controlPrefix}) led by ${lead}`,
    );
  } catch (error) {
    if (error instanceof HttpError) {
      const hint = /prefix/i.test(error.message) ? ' (choose another with --prefix)' : '';
      const message = error.message.replace(/^lead: /, `--lead ${lead}: `);
      throw new CliError(`${message}${hint}`);
    }
    throw error;
  }
}
