// One entry point for everything that holds other files and is unpacked at load time:
// zip archives, MBOX mailboxes (RFC 4155) and Outlook data files (MS-PST). Each entry
// comes back with its path inside the container, so the source path is kept.
import { expandArchive, type ExpandResult } from './archive';
import { expandMbox } from './mbox';
import { expandPst } from './pst';
import { ARCHIVE_DEFAULTS, type ArchiveLimits, type ContainerKind } from './types';

export async function expandContainer(
  kind: ContainerKind,
  filePath: string,
  targetDir: string,
  limits: ArchiveLimits = ARCHIVE_DEFAULTS,
): Promise<ExpandResult> {
  switch (kind) {
    case 'zip':
      return expandArchive(filePath, targetDir, limits);
    case 'mbox':
      return expandMbox(filePath, targetDir, limits);
    case 'pst':
      return expandPst(filePath, targetDir, limits);
  }
}
