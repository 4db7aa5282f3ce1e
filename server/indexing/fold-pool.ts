// The main thread's side of folding-in: one worker thread (fold-worker.mjs), started on
// first use and stopped after a minute idle so its copy of the concept space does not
// stay in memory. Requests run one after another.
import { Worker } from 'node:worker_threads';
import type { FoldedVector, FoldRequest } from './fold-core';

const WORKER_URL = new URL('./fold-worker.mjs', import.meta.url);
const IDLE_MS = 60_000;

interface Pending {
  resolve(vectors: FoldedVector[]): void;
  reject(error: Error): void;
}

export class FoldWorker {
  private worker: Worker | null = null;
  private readonly pending = new Map<number, Pending>();
  private nextId = 1;
  private idleTimer: NodeJS.Timeout | null = null;
  private closed = false;

  /** Vectors of the documents the version lacks, computed in the worker. */
  fold(request: FoldRequest): Promise<FoldedVector[]> {
    if (this.closed) return Promise.reject(new Error('the fold-in worker is closed'));
    const worker = this.start();
    if (this.idleTimer) clearTimeout(this.idleTimer);
    this.idleTimer = null;
    const id = this.nextId++;
    return new Promise<FoldedVector[]>((resolve, reject) => {
      this.pending.set(id, { resolve, reject });
      worker.postMessage({ id, request });
    });
  }

  private start(): Worker {
    if (this.worker) return this.worker;
    const worker = new Worker(WORKER_URL);
    worker.unref();
    worker.on(
      'message',
      (message: { id?: number; vectors?: FoldedVector[]; error?: string; ready?: boolean }) => {
        if (message.id === undefined) return;
        const waiting = this.pending.get(message.id);
        if (!waiting) return;
        this.pending.delete(message.id);
        if (message.error !== undefined) waiting.reject(new Error(message.error));
        else waiting.resolve(message.vectors ?? []);
        if (this.pending.size === 0) this.scheduleStop();
      },
    );
    const fail = (error: Error) => {
      if (this.worker !== worker) return;
      this.worker = null;
      for (const waiting of this.pending.values()) waiting.reject(error);
      this.pending.clear();
    };
    worker.on('error', (error: Error & { code?: string }) =>
      fail(
        new Error(
          error.code === 'ERR_WORKER_OUT_OF_MEMORY'
            ? 'folding-in ran out of memory'
            : `the fold-in worker crashed: ${error.message}`,
        ),
      ),
    );
    worker.on('exit', (code) => fail(new Error(`the fold-in worker stopped (exit code ${code})`)));
    this.worker = worker;
    return worker;
  }

  private scheduleStop() {
    if (this.idleTimer) clearTimeout(this.idleTimer);
    this.idleTimer = setTimeout(() => void this.stop(), IDLE_MS);
    this.idleTimer.unref();
  }

  private async stop(): Promise<void> {
    const worker = this.worker;
    if (!worker || this.pending.size > 0) return;
    this.worker = null;
    await worker.terminate();
  }

  async close(): Promise<void> {
    this.closed = true;
    if (this.idleTimer) clearTimeout(this.idleTimer);
    const worker = this.worker;
    this.worker = null;
    for (const waiting of this.pending.values()) waiting.reject(new Error('shutting down'));
    this.pending.clear();
    if (worker) await worker.terminate();
  }
}
