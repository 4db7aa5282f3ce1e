// Reads the entry names of a zip's central directory (PKWARE APPNOTE.TXT §4.3.12) without
// inflating anything, to tell an OOXML package (ECMA-376 Part 2) from a plain archive.
import yauzl from 'yauzl';

/** Names of up to `max` entries, or null when the file is not a readable zip. */
export function listZipNames(filePath: string, max = 5000): Promise<string[] | null> {
  return new Promise((resolve) => {
    // decodeStrings:false so that a hostile name does not abort the listing; we only compare.
    yauzl.open(
      filePath,
      { lazyEntries: true, decodeStrings: false, autoClose: true },
      (error, zip) => {
        if (error || !zip) return resolve(null);
        const names: string[] = [];
        let settled = false;
        const finish = (value: string[] | null) => {
          if (settled) return;
          settled = true;
          zip.close();
          resolve(value);
        };
        zip.on('entry', (entry: yauzl.Entry) => {
          names.push(Buffer.from(entry.fileName as unknown as Buffer).toString('latin1'));
          if (names.length >= max) finish(names);
          else zip.readEntry();
        });
        zip.on('end', () => finish(names));
        zip.on('error', () => finish(null));
        zip.readEntry();
      },
    );
  });
}

/** Reads one entry fully into memory, refusing more than `maxBytes` inflated bytes. */
export function readZipEntry(
  filePath: string,
  entryName: string,
  maxBytes: number,
): Promise<Buffer | null> {
  return new Promise((resolve) => {
    yauzl.open(
      filePath,
      { lazyEntries: true, autoClose: true, validateEntrySizes: true },
      (error, zip) => {
        if (error || !zip) return resolve(null);
        let settled = false;
        const finish = (value: Buffer | null) => {
          if (settled) return;
          settled = true;
          zip.close();
          resolve(value);
        };
        zip.on('entry', (entry: yauzl.Entry) => {
          if (entry.fileName !== entryName) return zip.readEntry();
          zip.openReadStream(entry, (streamError, stream) => {
            if (streamError || !stream) return finish(null);
            const chunks: Buffer[] = [];
            let total = 0;
            stream.on('data', (chunk: Buffer) => {
              total += chunk.length;
              if (total > maxBytes) {
                stream.destroy();
                return finish(null);
              }
              chunks.push(chunk);
            });
            stream.on('end', () => finish(Buffer.concat(chunks)));
            stream.on('error', () => finish(null));
          });
        });
        zip.on('end', () => finish(null));
        zip.on('error', () => finish(null));
        zip.readEntry();
      },
    );
  });
}

/**
 * Inflates every entry and discards the output, counting real bytes: 'within' when the total
 * stays within `maxBytes`, 'too large' when it does not, 'corrupt' when an entry cannot be read. Guards libraries that inflate a whole package in memory.
 */
export function inflatesWithin(
  filePath: string,
  maxBytes: number,
): Promise<'within' | 'too large' | 'corrupt'> {
  return new Promise((resolve) => {
    yauzl.open(
      filePath,
      { lazyEntries: true, autoClose: true, validateEntrySizes: true },
      (error, zip) => {
        if (error || !zip) return resolve('corrupt');
        let total = 0;
        let settled = false;
        const finish = (value: 'within' | 'too large' | 'corrupt') => {
          if (settled) return;
          settled = true;
          zip.close();
          resolve(value);
        };
        zip.on('entry', (entry: yauzl.Entry) => {
          if (entry.fileName.endsWith('/')) return zip.readEntry();
          zip.openReadStream(entry, (streamError, stream) => {
            if (streamError || !stream) return finish('corrupt');
            stream.on('data', (chunk: Buffer) => {
              total += chunk.length;
              if (total > maxBytes) {
                stream.destroy();
                finish('too large');
              }
            });
            stream.on('end', () => zip.readEntry());
            stream.on('error', () => finish('corrupt'));
          });
        });
        zip.on('end', () => finish('within'));
        zip.on('error', () => finish('corrupt'));
        zip.readEntry();
      },
    );
  });
}
