/**
 * Fair sharing of the trial pool between the runs that execute at once. The pool's threads are `slots`; a chunk
 * waits here for a slot instead of in piscina's own first-come queue (where a long run's hundreds of chunks would
 * stand in front of a small run's few). When a slot frees, it goes to the waiting run that has received the least
 * work so far (the sum of its granted chunks' costs), oldest request first among equals: a run that starts beside a
 * long one gets the free slots until it has had as much, so a small run finishes in about its usual time plus the
 * end of the chunks already running (chunks are sized by cost so that is well under a second: monte-carlo.ts).
 */
export interface FairGate {
  /** Waits for a slot for one chunk of `key` costing `cost`; resolves with the release function. */
  acquire(key: string, cost: number, signal?: AbortSignal): Promise<() => void>;
  /** Forget a run's account (its last chunk is done). */
  forget(key: string): void;
  readonly busy: number;
  readonly waiting: number;
}

interface Waiter {
  key: string;
  cost: number;
  seq: number;
  grant: (release: () => void) => void;
}

export function createFairGate(slots: number): FairGate {
  let busy = 0;
  let seq = 0;
  const served = new Map<string, number>();
  const waiters: Waiter[] = [];

  const release = () => {
    busy--;
    next();
  };

  function next(): void {
    while (busy < slots && waiters.length > 0) {
      let best = 0;
      for (let k = 1; k < waiters.length; k++) {
        const a = waiters[k];
        const b = waiters[best];
        const sa = served.get(a.key) ?? 0;
        const sb = served.get(b.key) ?? 0;
        if (sa < sb || (sa === sb && a.seq < b.seq)) best = k;
      }
      const [w] = waiters.splice(best, 1);
      busy++;
      served.set(w.key, (served.get(w.key) ?? 0) + w.cost);
      let released = false;
      w.grant(() => {
        if (released) return;
        released = true;
        release();
      });
    }
  }

  return {
    acquire(key, cost, signal) {
      return new Promise((resolve, reject) => {
        if (signal?.aborted) return reject(signal.reason ?? new Error("aborted"));
        const waiter: Waiter = {
          key,
          cost,
          seq: seq++,
          grant: (r) => {
            signal?.removeEventListener("abort", onAbort);
            resolve(r);
          },
        };
        const onAbort = () => {
          const at = waiters.indexOf(waiter);
          if (at >= 0) waiters.splice(at, 1);
          reject(signal!.reason ?? new Error("aborted"));
        };
        signal?.addEventListener("abort", onAbort, { once: true });
        waiters.push(waiter);
        next();
      });
    },
    forget(key) {
      if (!waiters.some((w) => w.key === key)) served.delete(key);
    },
    get busy() {
      return busy;
    },
    get waiting() {
      return waiters.length;
    },
  };
}
