// Test helper for backup.test.ts: a second process that keeps writing to a Quarry data
// folder the way the server does (a blob stored first, then one transaction adding a
// document, its text and an audit row) until it receives SIGTERM. Prints the number of
// committed writes after each one.
import { createHash, randomBytes } from 'node:crypto';
import { linkSync, mkdirSync, unlinkSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import Database from 'better-sqlite3';

const [dataDir, matterIdArg] = process.argv.slice(2);
const matterId = Number(matterIdArg);
const db = new Database(path.join(dataDir, 'quarry.db'), { fileMustExist: true });
db.pragma('journal_mode = WAL');
db.pragma('busy_timeout = 5000');
db.pragma('foreign_keys = ON');

const insertDoc = db.prepare(
  `INSERT INTO documents (matter_id, control_number, original_name, sha256, size, extract_status, created_at)
   VALUES (?, ?, ?, ?, ?, 'extracted', ?)`,
);
const insertText = db.prepare(
  'INSERT INTO document_texts (document_id, title, body) VALUES (?, ?, ?)',
);
const insertAudit = db.prepare(
  `INSERT INTO audit_events (at, matter_id, action, target_type, target_id, detail)
   VALUES (?, ?, 'test.write', 'document', ?, ?)`,
);
const write = db.transaction((n, sha, size) => {
  const now = new Date().toISOString();
  const id = Number(
    insertDoc.run(matterId, `W${String(n).padStart(6, '0')}`, `w${n}.txt`, sha, size, now)
      .lastInsertRowid,
  );
  insertText.run(id, `write ${n}`, `body of write ${n} `.repeat(200));
  insertAudit.run(now, matterId, String(id), JSON.stringify({ n, sha }));
});

let stopping = false;
process.on('SIGTERM', () => (stopping = true));
let n = 0;
const loop = () => {
  if (stopping) {
    db.close();
    process.exit(0);
  }
  n += 1;
  const content = randomBytes(2048 + (n % 7) * 512);
  const sha = createHash('sha256').update(content).digest('hex');
  const final = path.join(dataDir, 'blobs', sha.slice(0, 2), sha.slice(2, 4), sha);
  mkdirSync(path.dirname(final), { recursive: true });
  const incoming = path.join(dataDir, 'blobs', '.incoming');
  mkdirSync(incoming, { recursive: true });
  const temp = path.join(incoming, `${process.pid}-${n}.part`);
  writeFileSync(temp, content);
  linkSync(temp, final);
  unlinkSync(temp);
  write(n, sha, content.length);
  process.stdout.write(`${n}\n`);
  setImmediate(loop);
};
loop();
