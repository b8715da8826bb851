/**
 * The run queue: schedules and executes stored `queued` runs through the run dispatcher (the server's trial pool, or chunk
 * jobs for worker processes in distributed mode: server/engine/dispatcher.ts).
 *
 * - At most `maxRunning` runs execute at once, and at most one per person: the next run is the oldest queued run
 *   of a person with nothing running, so one person's big run or sweep never holds everyone else's small ones (the
 *   runs beside it share the trial pool chunk by chunk: trial-pool.ts). A run is claimed with a conditional UPDATE
 *   (queued → running), so two queues on one database never run it twice.
 * - start(): runs left `running` by a stopped or crashed server go back to `queued` (a re-run gives the
 *   same result: every trial's random stream comes from the seed alone), then the queue is pumped.
 * - Progress: trialsDone is written to the run row at most every `progressIntervalMs` (default 500 ms,
 *   ~2×/s) and pushed to listeners at the same pace; the end of a run is pushed at once.
 * - The result (run row + run_result) is written in one transaction, only while the row is still
 *   `running` (a cancel that won the race keeps its `cancelled`).
 * - Cancel: the run's AbortController aborts its chunks on the pool.
 * - When a run ends done or failed, its launcher gets a mail (failures to send are logged only).
 * - The writes that end a run (result, failure, cancel, re-queue; retried while the database is down) and the mail
 *   live in run-outcomes.ts; the stored JSON's shape in stored-result.ts; this file schedules and executes.
 * - Faults: a chunk whose worker thread exits or throws a plain Error fails its run with code
 *   WORKER_FAILED and the worker's message (the pool replaces the thread; later runs are unaffected).
 *   While the database is unreachable, the end of a run (result, failure or cancel) is kept in memory
 *   and its write retried with backoff (250 ms doubling to 5 s) until it succeeds, so a finished run is
 *   never lost; a failed look for queued runs is retried the same way, so runs accepted before an outage
 *   start once the database is back. When the queue is closed while the database is still down, the
 *   run stays `running` in the database and the next start re-queues it. No promise of the queue is
 *   left rejected (an unhandled rejection would stop the server).
 */
import type { DataSource } from "typeorm";
import type { ServerConfig } from "../config/env";
import { ServerStopping, type DispatchStatus, type RunDispatcher } from "../engine/dispatcher";
import { WorkerFailure } from "../../workers/trial-pool";
import { Run } from "../entities";
import type { RunState } from "../entities/run.entity";
import type { Logger } from "../logger";
import type { Mailer } from "../mail/mailer";
import { EngineError } from "../../shared/engine/errors";
import type { RunResult } from "../../shared/engine/result";
import type { RunOptions } from "../../shared/engine/run-options";
import { createRunOutcomes } from "./run-outcomes";

/** What listeners of one run hear. */
export type RunEvent =
  | { type: "progress"; state: RunState; trialsDone: number; trialsTotal: number; ratePerSecond: number | null; etaSeconds: number | null }
  | { type: "end"; state: RunState };

export interface RunQueue {
  /** Re-queues runs left `running`, then starts what may start. */
  start(): Promise<void>;
  /** Looks for queued runs to start (after a run is created). */
  kick(): void;
  /** Cancels a queued or running run; false when it had already finished. */
  cancel(runId: string): Promise<boolean>;
  /** Live progress of a run this queue executes, or null. */
  live(runId: string): Extract<RunEvent, { type: "progress" }> | null;
  /** Listens to one run; returns the unsubscribe function. */
  subscribe(runId: string, listener: (event: RunEvent) => void): () => void;
  /** Resolves when nothing runs and nothing is waiting (tests, demo seeding). */
  idle(): Promise<void>;
  /** Stops taking runs, puts the running ones back to `queued` and closes the pool. */
  close(): Promise<void>;
  /** The dispatcher (created now if it was given as a maker). */
  readonly dispatcher: RunDispatcher;
  /** The dispatcher's status, or null while it has not been created (no run yet). */
  dispatchStatus(): Promise<DispatchStatus | null>;
  readonly maxRunning: number;
}

export interface RunQueueDeps {
  dataSource: DataSource;
  mailer: Mailer;
  log: Logger;
  config: Pick<ServerConfig, "publicOrigin">;
  /** where trials are computed (embedded pool or distributed), or a maker called on the first run (tests that never run anything start no thread) */
  dispatcher: RunDispatcher | (() => RunDispatcher);
  /** default 1 */
  maxRunning?: number;
  /** default 500 ms */
  progressIntervalMs?: number;
  /** first retry delay of a write or a look for queued runs that failed because the database was down; default 250 ms, doubling to 5 s */
  retryMs?: number;
}

interface Active {
  controller: AbortController;
  startedMs: number;
  done: number;
  total: number;
  lastPushMs: number;
  cancelled: boolean;
  launcherId: string;
}

export { jsonSafe, toStoredResult } from "./stored-result";

export function createRunQueue(deps: RunQueueDeps): RunQueue {
  const { dataSource, log } = deps;
  let created: RunDispatcher | null = typeof deps.dispatcher === "function" ? null : deps.dispatcher;
  const getDispatcher = (): RunDispatcher => (created ??= (deps.dispatcher as () => RunDispatcher)());
  const maxRunning = deps.maxRunning ?? 1;
  if (!Number.isInteger(maxRunning) || maxRunning < 1) throw new Error("maxRunning must be an integer ≥ 1");
  const interval = deps.progressIntervalMs ?? 500;
  const runs = () => dataSource.getRepository(Run);
  const active = new Map<string, Active>();
  const executions = new Set<Promise<void>>();
  const listeners = new Map<string, Set<(e: RunEvent) => void>>();
  const idleWaiters: (() => void)[] = [];
  let closed = false;
  let pumping: Promise<void> | null = null;
  let again = false;
  const firstRetryMs = deps.retryMs ?? 250;
  let pumpRetryMs = firstRetryMs;
  let pumpRetry: NodeJS.Timeout | null = null;
  const sleepers = new Set<() => void>();
  const outcomes = createRunOutcomes({ ...deps, firstRetryMs, isClosed: () => closed, sleep: (ms) => sleep(ms) });
  const { persist, saveResult, requeueInterrupted, notifyLauncher: mailLauncher } = outcomes;
  const sleep = (ms: number) =>
    new Promise<void>((resolve) => {
      const wake = () => {
        clearTimeout(timer);
        sleepers.delete(wake);
        resolve();
      };
      const timer = setTimeout(wake, ms);
      sleepers.add(wake);
    });

  const emit = (runId: string, event: RunEvent) => {
    for (const l of listeners.get(runId) ?? []) {
      try {
        l(event);
      } catch (err) {
        log.error("run_listener_failed", { runId, message: (err as Error).message });
      }
    }
  };

  const liveOf = (runId: string): Extract<RunEvent, { type: "progress" }> | null => {
    const a = active.get(runId);
    if (!a) return null;
    const seconds = (Date.now() - a.startedMs) / 1000;
    const rate = seconds > 0 && a.done > 0 ? a.done / seconds : null;
    return { type: "progress", state: "running", trialsDone: a.done, trialsTotal: a.total, ratePerSecond: rate, etaSeconds: rate ? (a.total - a.done) / rate : null };
  };

  async function checkIdle(): Promise<void> {
    if (active.size > 0 || pumping || idleWaiters.length === 0) return;
    const waiting = closed ? 0 : await runs().countBy({ state: "queued" });
    if (waiting === 0 && active.size === 0 && !pumping) idleWaiters.splice(0).forEach((w) => w());
  }

  function pump(): Promise<void> {
    if (closed) return Promise.resolve();
    if (pumping) {
      again = true;
      return pumping;
    }
    pumping = (async () => {
      do {
        again = false;
        while (!closed && active.size < maxRunning) {
          // Fair share: the oldest queued run of a person who has no run executing in this queue. One person's long
          // run or sweep holds one slot; the others' runs start beside it. (Only this queue's own runs count: a row
          // left `running` by a server that died must not hold its launcher's later runs until a restart.)
          const busy = [...new Set([...active.values()].map((x) => x.launcherId))];
          const next = await runs()
            .createQueryBuilder("r")
            .where("r.state = :s", { s: "queued" })
            .andWhere(active.size ? "r.id NOT IN (:...ids)" : "1=1", { ids: [...active.keys()] })
            .andWhere(busy.length ? "r.launched_by_id NOT IN (:...busy)" : "1=1", { busy })
            .orderBy("r.queuedAt", "ASC")
            .addOrderBy("r.id", "ASC")
            .getOne();
          if (!next) break;
          const startedAt = new Date();
          const claim = await runs().update({ id: next.id, state: "queued" }, { state: "running", startedAt, trialsDone: 0 });
          if (claim.affected !== 1) continue; // another queue took it, or it was cancelled
          next.state = "running";
          next.startedAt = startedAt;
          const a: Active = { controller: new AbortController(), startedMs: Date.now(), done: 0, total: next.trialsTotal, lastPushMs: 0, cancelled: false, launcherId: next.launchedById };
          active.set(next.id, a);
          const p = execute(next, a)
            .catch((err) => log.error("run_execution_failed", { runId: next.id, message: (err as Error).message, stack: (err as Error)?.stack }))
            .finally(() => {
              executions.delete(p);
              active.delete(next.id);
              void pump();
            });
          executions.add(p);
        }
      } while (again && !closed);
      pumpRetryMs = firstRetryMs;
    })()
      .catch((err) => {
        log.error("run_queue_pump_failed", { message: (err as Error).message, retryMs: pumpRetryMs });
        // Look again later (the database may be down): runs accepted earlier must not wait for the next kick.
        if (!closed && !pumpRetry) {
          pumpRetry = setTimeout(() => {
            pumpRetry = null;
            void pump();
          }, pumpRetryMs);
          pumpRetry.unref();
          pumpRetryMs = Math.min(pumpRetryMs * 2, 5000);
        }
      })
      .finally(() => {
        pumping = null;
        void checkIdle().catch((err) => log.error("run_queue_idle_check_failed", { message: (err as Error).message }));
      });
    return pumping;
  }

  async function execute(run: Run, a: Active): Promise<void> {
    emit(run.id, liveOf(run.id)!);
    let writing: Promise<unknown> = Promise.resolve();
    const onProgress = ({ done, total }: { done: number; total: number }) => {
      a.done = done;
      a.total = total;
      const now = Date.now();
      if (now - a.lastPushMs < interval && done < total) return;
      a.lastPushMs = now;
      writing = writing
        .then(() => runs().update({ id: run.id, state: "running" }, { trialsDone: done }))
        .catch((err) => log.error("run_progress_write_failed", { runId: run.id, message: (err as Error).message }));
      emit(run.id, liveOf(run.id)!);
    };
    // 1. Compute (the pool), 2. store the outcome (retried while the database is down), 3. tell listeners.
    let result: RunResult | null = null;
    let failure: unknown = null;
    try {
      result = await getDispatcher().runMonteCarlo(run.netlist, run.limits, run.options as unknown as RunOptions, { signal: a.controller.signal, onProgress, runId: run.id });
    } catch (err) {
      failure = err;
    }
    await writing;
    let final: RunState;
    if (result) {
      const saved = await persist(run.id, "result", () => saveResult(run, result));
      if (saved === undefined) {
        if (closed) return; // left `running`: the next start re-runs it to the same result
        failure = new Error("the result could not be stored");
      } else {
        final = saved ? "done" : "cancelled";
        if (final === "done") await mailLauncher(run, "done", result);
        emit(run.id, { type: "end", state: final });
        return;
      }
    }
    const err = failure;
    if (closed && !a.cancelled) {
      // Server stopping: leave the run for the next start, marked as interrupted.
      await requeueInterrupted(run.id).catch(() => undefined);
      return;
    }
    if (a.cancelled || (err instanceof EngineError && err.code === "CANCELLED")) {
      final = "cancelled";
      await persist(run.id, "cancelled", () => runs().update({ id: run.id, state: "running" }, { state: "cancelled", finishedAt: new Date() }));
    } else {
      final = "failed";
      const code = err instanceof EngineError ? err.code : err instanceof WorkerFailure ? err.code : "INTERNAL";
      const message = err instanceof Error ? err.message : String(err);
      if (!(err instanceof EngineError)) log.error("run_failed", { runId: run.id, code, message, stack: (err as Error)?.stack });
      const res = await persist(run.id, "failed", () =>
        runs().update({ id: run.id, state: "running" }, { state: "failed", errorCode: code, errorMessage: message.slice(0, 1000), finishedAt: new Date(), trialsDone: a.done }),
      );
      if (res === undefined) {
        if (closed) return; // left `running`: the next start re-queues it
      } else if (res.affected === 1) await mailLauncher(run, "failed", undefined, message);
      else final = "cancelled"; // a cancel won the race
    }
    emit(run.id, { type: "end", state: final });
  }

  return {
    get dispatcher() {
      return getDispatcher();
    },
    dispatchStatus: async () => (created ? created.status() : null),
    maxRunning,
    async start() {
      await requeueInterrupted();
      await pump();
    },
    kick() {
      void pump();
    },
    async cancel(runId) {
      const finishedAt = new Date();
      const a = active.get(runId);
      if (a) a.cancelled = true;
      const res = await runs()
        .createQueryBuilder()
        .update(Run)
        .set({ state: "cancelled", finishedAt })
        .where("id = :id AND state IN (:...states)", { id: runId, states: ["queued", "running"] })
        .execute();
      if (res.affected !== 1) {
        if (a) a.cancelled = false;
        return false;
      }
      if (a) a.controller.abort();
      else emit(runId, { type: "end", state: "cancelled" });
      return true;
    },
    live: liveOf,
    subscribe(runId, listener) {
      let set = listeners.get(runId);
      if (!set) listeners.set(runId, (set = new Set()));
      set.add(listener);
      return () => {
        set.delete(listener);
        if (set.size === 0) listeners.delete(runId);
      };
    },
    idle() {
      return new Promise<void>((resolve) => {
        if (closed) return resolve();
        idleWaiters.push(resolve);
        void pump();
      });
    },
    async close() {
      closed = true;
      if (pumpRetry) clearTimeout(pumpRetry);
      pumpRetry = null;
      for (const wake of [...sleepers]) wake();
      for (const a of active.values()) a.controller.abort(new ServerStopping());
      await pumping;
      await Promise.allSettled([...executions]);
      idleWaiters.splice(0).forEach((w) => w());
      await created?.close();
    },
  };
}
