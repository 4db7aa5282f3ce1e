// The serving versions of the matters' indexes in memory: loaded from SQLite on first
// use (one load at a time per matter), dropped when a newer version takes over or
// documents are deleted, and a per-matter lock so fold-ins and version switches never
// interleave.
import { prepareForSearch, type ConceptSpace } from '../engine/index';
import { loadConceptSpace } from './persist';
import type { Db } from '../db/database';
import { currentIndexIdOf, findIndexVersion } from './queries';

/** The serving version of a matter's index. */
export interface LoadedIndex {
  indexId: number;
  version: number;
  space: ConceptSpace;
}

export class ServingCache {
  private readonly cache = new Map<number, LoadedIndex>();
  private readonly loading = new Map<number, Promise<LoadedIndex | null>>();
  private readonly locks = new Map<number, Promise<unknown>>();

  constructor(private readonly db: Db) {}

  /** Runs `work` after earlier work for the same matter. */
  withLock<T>(matterId: number, work: () => Promise<T>): Promise<T> {
    const previous = this.locks.get(matterId) ?? Promise.resolve();
    const next = previous.then(work, work);
    this.locks.set(
      matterId,
      next.catch(() => undefined),
    );
    return next;
  }

  /** The matter's serving index (loaded from SQLite on first use), or null before the first build. */
  async get(matterId: number): Promise<LoadedIndex | null> {
    const indexId = await currentIndexIdOf(this.db, matterId);
    if (indexId === null) return null;
    const cached = this.cache.get(matterId);
    if (cached?.indexId === indexId) return cached;
    let pending = this.loading.get(matterId);
    if (!pending) {
      pending = (async () => {
        const row = await findIndexVersion(this.db, indexId);
        if (!row) return null;
        const space = await loadConceptSpace(this.db, indexId);
        prepareForSearch(space);
        const loaded = { indexId, version: row.version, space };
        this.cache.set(matterId, loaded);
        return loaded;
      })().finally(() => this.loading.delete(matterId));
      this.loading.set(matterId, pending);
    }
    return pending;
  }

  /** Forgets the in-memory space; the next use reloads it. */
  invalidate(matterId: number): void {
    this.cache.delete(matterId);
  }
}
