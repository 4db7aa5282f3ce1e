// Each matter's in-memory keyword index (server/engine/search/keyword-index.ts), kept in step
// with the database: triggers log every change to searchable text in keyword_changes
// (migration 2026_12_02_0700), and before each search the index applies the changes
// logged since it last looked. A first build reads the matter's texts in batches and
// yields between them, so other requests keep being served.
import type SQLite from 'better-sqlite3';
import type { Logger } from 'pino';
import { KeywordIndex } from '../engine/index';

const BUILD_BATCH = 2000;
const APPLY_BATCH = 500;
/** Rebuild once this share of the index's slots belongs to removed or replaced documents. */
const DEAD_SHARE = 0.25;
/** Postings appended to plain-array tails before they are packed into typed arrays. */
const COMPACT_AFTER = 200_000;

interface Entry {
  index: KeywordIndex;
  /** Last keyword_changes id the index reflects. */
  seen: number;
}

interface TextRow {
  id: number;
  title: string;
  body: string;
}

export class KeywordIndexCache {
  private readonly entries = new Map<number, Entry>();
  private readonly building = new Map<number, Promise<Entry>>();
  private closed = false;

  constructor(
    private readonly sqlite: SQLite.Database,
    private readonly logger: Logger,
  ) {}

  /** The matter's keyword index, up to date with every committed change. */
  async indexFor(matterId: number): Promise<KeywordIndex> {
    let entry = this.entries.get(matterId);
    if (!entry) entry = await this.build(matterId);
    this.catchUp(matterId, entry);
    const index = entry.index;
    if (index.deadSlots > Math.max(1000, DEAD_SHARE * index.size) && !this.building.has(matterId)) {
      // Stale postings cost time on every search: rebuild in the background while this
      // index keeps serving.
      void this.build(matterId).catch((error: unknown) =>
        this.logger.error({ err: error, matterId }, 'keyword index rebuild failed'),
      );
    }
    return index;
  }

  /** Builds every matter's index in the background (at start-up). */
  warmAll(): void {
    const matterIds = this.sqlite.prepare('SELECT id FROM matters').pluck().all() as number[];
    void (async () => {
      for (const matterId of matterIds) {
        if (this.closed) return;
        await this.indexFor(matterId);
      }
    })().catch((error: unknown) =>
      this.logger.error({ err: error }, 'keyword index warm-up failed'),
    );
  }

  /**
   * Drops a matter's index so the next search builds it afresh from the database: after a
   * purge, not even the removed document's stale postings stay in memory.
   */
  forget(matterId: number): void {
    this.entries.delete(matterId);
  }

  async close(): Promise<void> {
    this.closed = true;
    await Promise.allSettled(this.building.values());
  }

  private build(matterId: number): Promise<Entry> {
    let pending = this.building.get(matterId);
    if (pending) return pending;
    pending = (async () => {
      const started = performance.now();
      // Changes up to `seen` are in the texts read below; later ones are applied after.
      const seen = this.lastChange(matterId);
      const index = new KeywordIndex();
      const batch = this.sqlite.prepare(
        `SELECT d.id AS id, t.title AS title, t.body AS body
           FROM documents d JOIN document_texts t ON t.document_id = d.id
          WHERE d.matter_id = ? AND d.extract_status = 'extracted' AND d.id > ?
          ORDER BY d.id LIMIT ?`,
      );
      let after = 0;
      for (;;) {
        if (this.closed) throw new Error('The keyword index was closed while building.');
        const rows = batch.all(matterId, after, BUILD_BATCH) as TextRow[];
        for (const row of rows) index.add(row.id, row.title, row.body);
        if (rows.length < BUILD_BATCH) break;
        after = rows[rows.length - 1].id;
        // Let other requests in between batches.
        await new Promise((resolve) => setImmediate(resolve));
      }
      index.compact();
      const entry: Entry = { index, seen };
      this.catchUp(matterId, entry);
      this.entries.set(matterId, entry);
      this.logger.debug(
        { matterId, documents: index.size, ms: Math.round(performance.now() - started) },
        'keyword index built',
      );
      return entry;
    })().finally(() => this.building.delete(matterId));
    this.building.set(matterId, pending);
    return pending;
  }

  private lastChangeStatement?: SQLite.Statement;

  /** The newest logged change of the matter (asked before every search: prepared once). */
  private lastChange(matterId: number): number {
    this.lastChangeStatement ??= this.sqlite
      .prepare('SELECT max(id) FROM keyword_changes WHERE matter_id = ?')
      .pluck();
    return (this.lastChangeStatement.get(matterId) as number | null) ?? 0;
  }

  /** Applies the logged changes after entry.seen: each document is re-read as it is now. */
  private catchUp(matterId: number, entry: Entry): void {
    const latest = this.lastChange(matterId);
    if (latest <= entry.seen) return;
    const changed = this.sqlite
      .prepare(
        'SELECT DISTINCT document_id FROM keyword_changes WHERE matter_id = ? AND id > ? AND id <= ?',
      )
      .pluck()
      .all(matterId, entry.seen, latest) as number[];
    for (let start = 0; start < changed.length; start += APPLY_BATCH) {
      const ids = changed.slice(start, start + APPLY_BATCH);
      const rows = this.sqlite
        .prepare(
          `SELECT d.id AS id, t.title AS title, t.body AS body
             FROM documents d JOIN document_texts t ON t.document_id = d.id
            WHERE d.matter_id = ? AND d.extract_status = 'extracted'
              AND d.id IN (SELECT value FROM json_each(?))`,
        )
        .all(matterId, JSON.stringify(ids)) as TextRow[];
      const current = new Map(rows.map((r) => [r.id, r]));
      for (const id of ids) {
        const row = current.get(id);
        if (row) entry.index.add(row.id, row.title, row.body);
        else entry.index.remove(id);
      }
    }
    if (entry.index.uncompacted > COMPACT_AFTER) entry.index.compact();
    entry.seen = latest;
    // Applied: the log need not keep them (one server process serves a database), unless
    // a build in progress has yet to replay them.
    if (this.building.has(matterId)) return;
    this.sqlite
      .prepare('DELETE FROM keyword_changes WHERE matter_id = ? AND id <= ?')
      .run(matterId, latest);
  }
}
