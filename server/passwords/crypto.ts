// The matter password list is stored encrypted at rest with AES-256-GCM (NIST SP 800-38D:
// a fresh 96-bit IV per value, the 128-bit tag checked on reading). The key is 32 random
// bytes in <dataDir>/secrets/password-list.key (created with mode 0600 on first use), so a
// copy of the database alone does not reveal the passwords.
import { createCipheriv, createDecipheriv, randomBytes } from 'node:crypto';
import { mkdir, readFile, writeFile } from 'node:fs/promises';
import path from 'node:path';

const keys = new Map<string, Buffer>();

export async function passwordListKey(dataDir: string): Promise<Buffer> {
  const cached = keys.get(dataDir);
  if (cached) return cached;
  const file = path.join(dataDir, 'secrets', 'password-list.key');
  let key: Buffer;
  try {
    key = await readFile(file);
  } catch {
    await mkdir(path.dirname(file), { recursive: true, mode: 0o700 });
    key = randomBytes(32);
    // "wx": never overwrite a key another process just wrote; read theirs instead.
    await writeFile(file, key, { mode: 0o600, flag: 'wx' }).catch(async () => {
      key = await readFile(file);
    });
  }
  if (key.length !== 32) throw new Error('the password-list key file is not 32 bytes');
  keys.set(dataDir, key);
  return key;
}

export interface Sealed {
  ciphertext: Buffer;
  iv: Buffer;
  tag: Buffer;
}

export function seal(key: Buffer, plaintext: string, aad: string): Sealed {
  const iv = randomBytes(12);
  const cipher = createCipheriv('aes-256-gcm', key, iv);
  cipher.setAAD(Buffer.from(aad, 'utf8'));
  const ciphertext = Buffer.concat([cipher.update(plaintext, 'utf8'), cipher.final()]);
  return { ciphertext, iv, tag: cipher.getAuthTag() };
}

export function open(key: Buffer, sealed: Sealed, aad: string): string {
  const decipher = createDecipheriv('aes-256-gcm', key, sealed.iv);
  decipher.setAAD(Buffer.from(aad, 'utf8'));
  decipher.setAuthTag(sealed.tag);
  return Buffer.concat([decipher.update(sealed.ciphertext), decipher.final()]).toString('utf8');
}
