// One worker thread that renders production pages (render-core.ts), started on first use
// and stopped when idle, so building a production never runs PDF work on the API's thread.
import { Worker } from 'node:worker_threads';
import type { RenderResult, RenderTask } from './render-core';

const WORKER_URL = new URL('./render-worker.mjs', import.meta.url);
const IDLE_MS = 30_000;

interface Pending {
  resolve: (r: RenderResult) => void;
  reject: (e: Error) => void;
}

export class RenderPool {
  private worker: Worker | null = null;
  private ready: Promise<void> | null = null;
  private readonly pending = new Map<number, Pending>();
  private nextId = 1;
  private idleTimer: NodeJS.Timeout | null = null;

  private start(): Promise<void> {
    if (this.ready) return this.ready;
    const worker = new Worker(WORKER_URL, { resourceLimits: { maxOldGenerationSizeMb: 1024 } });
    // The worker never keeps the process alive on its own; the idle timer stops it.
    worker.unref();
    this.worker = worker;
    this.ready = new Promise((resolve, reject) => {
      worker.once('error', reject);
      worker.on(
        'message',
        (message: { ready?: true; id?: number; result?: RenderResult; error?: string }) => {
          if (message.ready) return resolve();
          const waiting = this.pending.get(message.id!);
          if (!waiting) return;
          this.pending.delete(message.id!);
          if (message.error !== undefined) waiting.reject(new Error(message.error));
          else waiting.resolve(message.result!);
          this.scheduleIdle();
        },
      );
    });
    worker.on('error', (error) => this.fail(error));
    worker.on('exit', (code) => {
      if (this.worker === worker) this.fail(new Error(`the page renderer stopped (exit ${code})`));
    });
    return this.ready;
  }

  private fail(error: Error) {
    for (const waiting of this.pending.values()) waiting.reject(error);
    this.pending.clear();
    this.worker = null;
    this.ready = null;
  }

  private scheduleIdle() {
    if (this.idleTimer) clearTimeout(this.idleTimer);
    if (this.pending.size > 0) return;
    this.idleTimer = setTimeout(() => void this.close(), IDLE_MS);
    this.idleTimer.unref();
  }

  async render(task: RenderTask): Promise<RenderResult> {
    if (this.idleTimer) clearTimeout(this.idleTimer);
    await this.start();
    const id = this.nextId++;
    return new Promise((resolve, reject) => {
      this.pending.set(id, { resolve, reject });
      this.worker!.postMessage({ id, task });
    });
  }

  async close(): Promise<void> {
    if (this.idleTimer) clearTimeout(this.idleTimer);
    const worker = this.worker;
    this.worker = null;
    this.ready = null;
    if (worker) await worker.terminate();
  }
}
