// At most a few searches are worked on at once; the rest wait their turn without holding
// the event loop. A search is a run of short synchronous steps (ranking, SQL, snippets)
// with awaits between them: 200 of them in flight interleave all their steps, so every
// other request (a sign-in check, a page of documents) waits behind all of them. With a
// bounded number in flight, other requests get in between two steps instead, and the
// searches themselves finish in about the same total time (the work is the same).
export class Gate {
  private active = 0;
  private readonly waiting: (() => void)[] = [];

  constructor(private readonly limit: number) {}

  async run<T>(work: () => Promise<T>): Promise<T> {
    if (this.active >= this.limit) await new Promise<void>((resolve) => this.waiting.push(resolve));
    else this.active++;
    try {
      return await work();
    } finally {
      const next = this.waiting.shift();
      if (next) next();
      else this.active--;
    }
  }
}

/** Searches worked on at once (per process). */
export const SEARCHES_IN_FLIGHT = 2;
