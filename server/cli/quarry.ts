#!/usr/bin/env node
// `npm run quarry -- <verb> [options]`: the command line over the same engine
// the server uses. Each verb lives in server/cli/commands/<verb>.ts and exports `run`.
// Errors are printed as one line naming the problem, never a stack trace.
import { CliError } from './cli-error';

type Command = { summary: string; load: () => Promise<{ run: (argv: string[]) => Promise<void> }> };

const commands: Record<string, Command> = {
  svd: {
    summary: 'svd --matrix <file.mtx> --k N [--json]   top singular values of a Matrix Market file',
    load: () => import('./commands/svd'),
  },
  eval: {
    summary:
      'eval --docs d.jsonl --queries q.jsonl --qrels qrels.txt --mode concept|keyword|hybrid [--k N] [--json]',
    load: () => import('./commands/eval'),
  },
  import: {
    summary: 'import --matter "<name>" [--custodian "<name>"] <folder>   bulk load a folder tree',
    load: () => import('./commands/import'),
  },
  backup: {
    summary:
      'backup --out <dir>   consistent copy of the database and blobs, with a SHA-256 manifest',
    load: () => import('./commands/backup'),
  },
  restore: {
    summary: 'restore <dir> [--force]   verify a backup and restore it into the data folder',
    load: () => import('./commands/restore'),
  },
};

function usage(): string {
  return [
    'usage: npm run quarry -- <command> [options]',
    '',
    ...Object.values(commands).map((c) => `  ${c.summary}`),
  ].join('\n');
}

async function main(): Promise<void> {
  const [verb, ...rest] = process.argv.slice(2);
  if (!verb || verb === '--help' || verb === 'help') {
    console.log(usage());
    return;
  }
  const command = commands[verb];
  if (!command)
    throw new CliError(
      `unknown command "${verb}"; expected one of: ${Object.keys(commands).join(', ')}`,
    );
  const module = await command.load();
  await module.run(rest);
}

main().catch((error: unknown) => {
  if (error instanceof CliError) {
    console.error(`quarry: ${error.message}`);
    process.exit(error.exitCode);
  }
  const message = error instanceof Error ? error.message : String(error);
  console.error(`quarry: unexpected error: ${message}`);
  if (process.env.QUARRY_DEBUG) console.error(error);
  process.exit(1);
});
