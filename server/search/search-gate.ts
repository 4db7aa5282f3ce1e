// At most a few searches are worked on per turn of the event loop; the rest wait their
// turn without holding it. A search's steps (ranking, SQL through better-sqlite3,
// snippets) resolve at once, so a search started inside a socket's callback runs to its
// end before the next callback: 200 requests read in one poll phase became 200 searches
// back to back (about 300 ms), and a sign-in check read in the same phase waited behind
// all of them (seen in `npm run bench:load`: 3 loop turns a second under load).
// So a search never starts where it is asked for: it is queued, and a setImmediate pump
// starts at most `limit` of them in the check phase, after the poll phase has read every
// waiting socket (Node.js docs, "The Node.js Event Loop": immediates queued while the
// check phase runs wait for the next turn). Other requests get in between two turns; the
// searches finish in about the same total time (the work is the same), in arrival order.
export class Gate {
  private active = 0;
  private readonly waiting: (() => void)[] = [];
  private pumpQueued = false;

  constructor(private readonly limit: number) {}

  async run<T>(work: () => Promise<T>): Promise<T> {
    await new Promise<void>((resolve) => {
      this.waiting.push(resolve);
      this.schedule();
    });
    try {
      return await work();
    } finally {
      this.active--;
      this.schedule();
    }
  }

  private schedule(): void {
    if (this.pumpQueued || this.waiting.length === 0 || this.active >= this.limit) return;
    this.pumpQueued = true;
    setImmediate(() => {
      this.pumpQueued = false;
      while (this.active < this.limit && this.waiting.length > 0) {
        this.active++;
        this.waiting.shift()!();
      }
    });
  }
}

/** Searches started per turn of the event loop, and worked on at once (per process). */
export const SEARCHES_IN_FLIGHT = 4;
