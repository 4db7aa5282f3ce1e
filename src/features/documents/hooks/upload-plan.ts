import type { UploadedFile } from '@shared/schemas/documents';

// Files go up in requests of modest size so a slow or refused request costs little and a
// single large file travels alone; each request becomes one batch on the server.
const REQUEST_MAX_FILES = 20;
const REQUEST_MAX_BYTES = 64 * 1024 * 1024;

export function chunkForUpload<T extends { file: { size: number } }>(items: readonly T[]): T[][] {
  const chunks: T[][] = [];
  let current: T[] = [];
  let bytes = 0;
  for (const item of items) {
    const size = item.file.size;
    if (
      current.length > 0 &&
      (current.length >= REQUEST_MAX_FILES || bytes + size > REQUEST_MAX_BYTES)
    ) {
      chunks.push(current);
      current = [];
      bytes = 0;
    }
    current.push(item);
    bytes += size;
  }
  if (current.length) chunks.push(current);
  return chunks;
}

/**
 * Pairs the server's rows with the files sent: an ordinary file answers with its own
 * name as path, an archive with "name.zip/inner/path" rows.
 */
export function matchResults(
  names: readonly string[],
  files: readonly UploadedFile[],
): UploadedFile[][] {
  const claimed = new Set<number>();
  return names.map((name) => {
    const mine: UploadedFile[] = [];
    files.forEach((row, index) => {
      if (claimed.has(index)) return;
      if (row.path === name || row.path.startsWith(`${name}/`)) {
        // An ordinary file has exactly one row; stop at the first for a same-named sibling.
        if (row.path === name && mine.some((m) => m.path === name)) return;
        claimed.add(index);
        mine.push(row);
      }
    });
    return mine;
  });
}
