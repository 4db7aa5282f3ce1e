// `npm run quarry -- backup --out <dir>`: a consistent copy of the database (SQLite's online
// backup API) and the blob store, with a manifest of SHA-256 hashes (docs/BACKUP.md). Safe
// while the server runs.
import { loadConfig } from '../../config';
import { BackupError, createBackup } from '../../backup/service';
import { parseCommandArgs } from '../args';
import { CliError } from '../cli-error';

export async function run(argv: string[]): Promise<void> {
  const { values } = parseCommandArgs(argv, { out: { type: 'string' } });
  if (!values.out) throw new CliError('--out <dir> is required (a new or empty folder)');
  const config = loadConfig();
  try {
    const result = await createBackup({
      dbFile: config.dbFile,
      blobDir: config.blobDir,
      outDir: values.out,
    });
    const blobs = result.manifest.files.length - 1;
    console.log(
      `Backed up ${config.dataDir} to ${result.outDir}: the database ` +
        `(${result.manifest.tables.documents ?? 0} documents, ${result.manifest.tables.audit_events ?? 0} audit events) ` +
        `and ${blobs} blob(s), listed with their SHA-256 in manifest.json`,
    );
    if (result.missingBlobs.length > 0)
      console.warn(
        `warning: ${result.missingBlobs.length} original(s) the database names were not in the blob store ` +
          `(first: ${result.missingBlobs[0]})`,
      );
  } catch (error) {
    if (error instanceof BackupError) throw new CliError(error.message);
    throw error;
  }
}
