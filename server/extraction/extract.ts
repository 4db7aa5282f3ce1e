// Public entry point for extraction. Parsing runs in a worker thread so that a hostile
// file (a PDF that spins, a DOCX that eats memory) can be stopped: on timeout the worker is
// terminated, which a Promise.race in the same thread cannot do to synchronous parser work.
import { Worker } from 'node:worker_threads';
import { precheckFile } from './precheck';
import {
  EXTRACT_DEFAULTS,
  MIME_OF,
  type ExtractLimits,
  type ExtractResult,
  type FailureReason,
  type SniffResult,
} from './types';

const WORKER_URL = new URL('./extract-worker.mjs', import.meta.url);

export interface PoolOptions {
  /** Parallel workers (the machine has 2 cores; extraction jobs are sequential by default). */
  size?: number;
  /** Heap ceiling per worker; a file needing more fails instead of taking the server down. */
  maxHeapMb?: number;
}

interface Task {
  filePath: string;
  sniffed: SniffResult;
  size: number;
  limits: ExtractLimits;
  resolve: (result: ExtractResult) => void;
}

interface Slot {
  worker: Worker;
  ready: Promise<void>;
  busy: boolean;
}

const failure = (sniffed: SniffResult, reason: FailureReason): ExtractResult => ({
  ok: false,
  kind: sniffed.kind,
  mime: sniffed.mime || MIME_OF[sniffed.kind],
  reason,
});

/** Structured clone turns Buffers into Uint8Arrays; give callers Buffers back. */
function revive(result: ExtractResult): ExtractResult {
  if (!result.ok) return result;
  return {
    ...result,
    attachments: result.attachments.map((a) => ({
      ...a,
      content: Buffer.from(a.content.buffer, a.content.byteOffset, a.content.byteLength),
    })),
  };
}

export class ExtractionPool {
  private readonly size: number;
  private readonly maxHeapMb: number;
  private readonly slots: Slot[] = [];
  private readonly queue: Task[] = [];
  private nextId = 1;
  private closed = false;

  constructor(options: PoolOptions = {}) {
    this.size = Math.max(1, options.size ?? 1);
    this.maxHeapMb = options.maxHeapMb ?? 1024;
  }

  /** Extracts text and metadata; resolves to a failure (never rejects) for bad files. */
  async extract(
    filePath: string,
    originalName: string,
    limits: Partial<ExtractLimits> = {},
  ): Promise<ExtractResult> {
    if (this.closed) throw new Error('the extraction pool is closed');
    const settings: ExtractLimits = { ...EXTRACT_DEFAULTS, ...limits };
    const checked = await precheckFile(filePath, originalName, settings);
    if (checked.done) return checked.done;
    return new Promise((resolve) => {
      this.queue.push({
        filePath,
        sniffed: checked.sniffed,
        size: checked.size,
        limits: settings,
        resolve,
      });
      this.pump();
    });
  }

  /** Starts the workers ahead of the first file (loading the parsers takes a few seconds). */
  async warm(): Promise<void> {
    while (this.slots.length < this.size) this.spawn();
    await Promise.all(this.slots.map((slot) => slot.ready));
  }

  /** Stops all workers; pending tasks resolve as timed out. */
  async close(): Promise<void> {
    this.closed = true;
    for (const task of this.queue.splice(0))
      task.resolve(failure(task.sniffed, 'extraction timed out'));
    await Promise.all(this.slots.splice(0).map((slot) => slot.worker.terminate()));
  }

  private spawn(): Slot {
    const worker = new Worker(WORKER_URL, {
      resourceLimits: { maxOldGenerationSizeMb: this.maxHeapMb },
    });
    const ready = new Promise<void>((resolve, reject) => {
      const onMessage = (message: { ready?: boolean }) => {
        if (message.ready) {
          worker.off('message', onMessage);
          resolve();
        }
      };
      worker.on('message', onMessage);
      worker.once('error', reject);
      worker.once('exit', () => reject(new Error('extraction worker exited during start-up')));
    });
    ready.catch(() => undefined);
    const slot: Slot = { worker, ready, busy: false };
    worker.unref();
    this.slots.push(slot);
    return slot;
  }

  private retire(slot: Slot): void {
    const index = this.slots.indexOf(slot);
    if (index >= 0) this.slots.splice(index, 1);
    void slot.worker.terminate();
  }

  private pump(): void {
    while (this.queue.length > 0) {
      const slot =
        this.slots.find((s) => !s.busy) ?? (this.slots.length < this.size ? this.spawn() : null);
      if (!slot) return;
      const task = this.queue.shift()!;
      slot.busy = true;
      void this.run(slot, task);
    }
  }

  private async run(slot: Slot, task: Task): Promise<void> {
    const { worker } = slot;
    worker.ref();
    let settled = false;
    const clock: { timer?: NodeJS.Timeout } = {};
    const finish = (result: ExtractResult, healthy: boolean) => {
      if (settled) return;
      settled = true;
      clearTimeout(clock.timer);
      worker.off('message', onMessage);
      worker.off('error', onError);
      worker.off('exit', onExit);
      if (healthy) {
        slot.busy = false;
        worker.unref();
      } else {
        this.retire(slot);
      }
      task.resolve(result);
      if (!this.closed) this.pump();
    };
    const id = this.nextId++;
    const arm = (ms: number) => {
      clearTimeout(clock.timer);
      clock.timer = setTimeout(
        () => finish(failure(task.sniffed, 'extraction timed out'), false),
        ms,
      );
    };
    const onMessage = (message: { id?: number; result?: ExtractResult; extendMs?: number }) => {
      if (message.id !== id) return;
      if (message.result) finish(revive(message.result), true);
      // OCR announces each page with its own time limit; the file's clock restarts from it.
      else if (message.extendMs && !settled) arm(message.extendMs + task.limits.timeoutMs);
    };
    const onError = (error: Error & { code?: string }) =>
      finish(
        failure(
          task.sniffed,
          error.code === 'ERR_WORKER_OUT_OF_MEMORY'
            ? 'extraction ran out of memory'
            : 'file could not be read',
        ),
        false,
      );
    const onExit = () => finish(failure(task.sniffed, 'file could not be read'), false);
    worker.on('message', onMessage);
    worker.on('error', onError);
    worker.on('exit', onExit);
    try {
      await slot.ready;
    } catch {
      return finish(failure(task.sniffed, 'file could not be read'), false);
    }
    // The clock starts once the worker is up, so start-up time is not charged to the file.
    arm(task.limits.timeoutMs);
    worker.postMessage({
      id,
      filePath: task.filePath,
      sniffed: task.sniffed,
      size: task.size,
      limits: task.limits,
    });
  }
}

let sharedPool: ExtractionPool | null = null;

/**
 * Extracts text and metadata from a file in a shared worker pool. `originalName` is the name
 * the user gave the file (its extension only breaks ties). Resolves to a failure, never
 * rejects, for empty, oversized, corrupt, encrypted, hostile or unsupported files.
 */
export function extractFile(
  filePath: string,
  originalName: string,
  limits: Partial<ExtractLimits> = {},
): Promise<ExtractResult> {
  return extractionPool().extract(filePath, originalName, limits);
}

/** The shared pool (created on first use); call `.warm()` at server start-up. */
export function extractionPool(): ExtractionPool {
  sharedPool ??= new ExtractionPool();
  return sharedPool;
}

/** Stops the shared pool's workers (for graceful shutdown and test teardown). */
export async function closeExtractionPool(): Promise<void> {
  const pool = sharedPool;
  sharedPool = null;
  await pool?.close();
}

/** Same as extractFile but in the calling thread, without a hard time limit (tools, tests). */
export async function extractFileInProcess(
  filePath: string,
  originalName: string,
  limits: Partial<ExtractLimits> = {},
): Promise<ExtractResult> {
  // Loaded on demand so that importing this module does not load every parser.
  const { extractInProcess } = await import('./extract-core');
  return extractInProcess(filePath, originalName, limits);
}
