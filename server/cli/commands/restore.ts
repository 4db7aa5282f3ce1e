// `npm run quarry -- restore <dir> [--force]`: verifies a backup against its manifest and
// restores it into the configured data folder (QUARRY_DATA_DIR). Stop Quarry first.
import { loadConfig } from '../../config';
import { BackupError, restoreBackup } from '../../backup/service';
import { parseCommandArgs } from '../args';
import { CliError } from '../cli-error';

export async function run(argv: string[]): Promise<void> {
  const { values, positionals } = parseCommandArgs(argv, { force: { type: 'boolean' } }, true);
  if (positionals.length !== 1) throw new CliError('give exactly one backup folder to restore');
  const config = loadConfig();
  try {
    const result = await restoreBackup(positionals[0], config.dataDir, { force: values.force });
    console.log(
      `Restored the backup of ${result.manifest.createdAt} into ${result.dataDir}` +
        `${result.replaced ? ' (its previous database and blobs were replaced)' : ''}: ` +
        `${result.manifest.files.length} file(s) verified against manifest.json`,
    );
  } catch (error) {
    if (error instanceof BackupError) throw new CliError(error.message);
    throw error;
  }
}
