import { describe, expect, it } from 'vitest';
import { Gate } from './search-gate';

describe('search gate', () => {
  it('runs at most the limit at once', async () => {
    const gate = new Gate(2);
    let active = 0;
    let most = 0;
    await Promise.all(
      Array.from({ length: 10 }, () =>
        gate.run(async () => {
          most = Math.max(most, ++active);
          await new Promise((r) => setTimeout(r, 2));
          active--;
        }),
      ),
    );
    expect(most).toBe(2);
  });

  it('lets the event loop turn between searches asked for in one phase', async () => {
    // Like 50 search requests read in one poll phase: each asks in a callback of its own
    // (Node drains microtasks between expired timers of one list, as between socket
    // callbacks), and its work resolves at once, like SQL through better-sqlite3. Run
    // where it was asked for, all 50 would finish before the loop reaches its next phase.
    const gate = new Gate(2);
    let done = 0;
    let doneWhenLoopRan = -1;
    let mostPerTurn = 0;
    let atLastTurn = 0;
    const turn = () => {
      mostPerTurn = Math.max(mostPerTurn, done - atLastTurn);
      atLastTurn = done;
      if (done < 50) setImmediate(turn);
    };
    const all: Promise<void>[] = [];
    await new Promise<void>((resolve) => {
      for (let i = 0; i < 50; i++)
        setTimeout(() => {
          if (i === 0) {
            setImmediate(() => (doneWhenLoopRan = done));
            setImmediate(turn);
          }
          all.push(
            gate.run(async () => {
              await Promise.resolve();
              done++;
            }),
          );
          if (i === 49) resolve();
        }, 1);
    });
    await Promise.all(all);
    expect(done).toBe(50);
    expect(doneWhenLoopRan).toBe(0);
    expect(mostPerTurn).toBeLessThanOrEqual(2);
  });
});
