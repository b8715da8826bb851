/**
 * The run queue: executes stored `queued` runs on the server's trial pool.
 *
 * - At most `maxRunning` runs execute at once, oldest `queuedAt` first. A run is claimed with a
 *   conditional UPDATE (queued → running), so two queues on one database never run it twice.
 * - start(): runs left `running` by a stopped or crashed server go back to `queued` (a re-run gives the
 *   same result: every trial's random stream comes from the seed alone), then the queue is pumped.
 * - Progress: trialsDone is written to the run row at most every `progressIntervalMs` (default 500 ms,
 *   ~2×/s) and pushed to listeners at the same pace; the end of a run is pushed at once.
 * - The result (run row + run_result) is written in one transaction, only while the row is still
 *   `running` (a cancel that won the race keeps its `cancelled`).
 * - Cancel: the run's AbortController aborts its chunks on the pool.
 * - When a run ends done or failed, its launcher gets a mail (failures to send are logged only).
 */
import type { DataSource } from "typeorm";
import type { ServerConfig } from "../config/env";
import type { TrialPool } from "../engine/trial-pool";
import { Design, DesignRevision, Run, RunResultRow, User } from "../entities";
import type { RunState } from "../entities/run.entity";
import type { Logger } from "../logger";
import type { Mailer } from "../mail/mailer";
import { EngineError } from "../../shared/engine/errors";
import type { RunResult } from "../../shared/engine/result";
import type { RunOptions } from "../../shared/engine/run-options";

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
  /** The trial pool (created now if it was given as a maker). */
  readonly pool: TrialPool;
  readonly maxRunning: number;
}

export interface RunQueueDeps {
  dataSource: DataSource;
  mailer: Mailer;
  log: Logger;
  config: Pick<ServerConfig, "publicOrigin">;
  /** the pool, or a maker called on the first run (tests that never run anything start no thread) */
  pool: TrialPool | (() => TrialPool);
  /** default 1 */
  maxRunning?: number;
  /** default 500 ms */
  progressIntervalMs?: number;
}

interface Active {
  controller: AbortController;
  startedMs: number;
  done: number;
  total: number;
  lastPushMs: number;
  cancelled: boolean;
}

/** The stored JSON of a finished run: the engine result made JSON-safe, plus the grid and nominal curves. */
export function toStoredResult(result: RunResult): Record<string, unknown> {
  const nominal: Record<string, number[]> = {};
  for (const s of result.envelopes.series) nominal[s.metric.replace(/_db$/, "")] = s.nominal.slice();
  return { ...(jsonSafe(result) as Record<string, unknown>), freqs: result.envelopes.freqs.slice(), nominal };
}

/** Typed arrays → arrays, non-finite numbers → null, recursively. */
export function jsonSafe(value: unknown): unknown {
  if (typeof value === "number") return Number.isFinite(value) ? value : null;
  if (ArrayBuffer.isView(value)) return Array.from(value as unknown as ArrayLike<number>, (x) => (Number.isFinite(x) ? x : null));
  if (Array.isArray(value)) return value.map(jsonSafe);
  if (value !== null && typeof value === "object") {
    const out: Record<string, unknown> = {};
    for (const [k, v] of Object.entries(value)) if (v !== undefined) out[k] = jsonSafe(v);
    return out;
  }
  return value;
}

export function createRunQueue(deps: RunQueueDeps): RunQueue {
  const { dataSource, log } = deps;
  let created: TrialPool | null = typeof deps.pool === "function" ? null : deps.pool;
  const getPool = (): TrialPool => (created ??= (deps.pool as () => TrialPool)());
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
          const next = await runs()
            .createQueryBuilder("r")
            .where("r.state = :s", { s: "queued" })
            .andWhere(active.size ? "r.id NOT IN (:...ids)" : "1=1", { ids: [...active.keys()] })
            .orderBy("r.queuedAt", "ASC")
            .addOrderBy("r.id", "ASC")
            .getOne();
          if (!next) break;
          const startedAt = new Date();
          const claim = await runs().update({ id: next.id, state: "queued" }, { state: "running", startedAt, trialsDone: 0 });
          if (claim.affected !== 1) continue; // another queue took it, or it was cancelled
          next.state = "running";
          next.startedAt = startedAt;
          const a: Active = { controller: new AbortController(), startedMs: Date.now(), done: 0, total: next.trialsTotal, lastPushMs: 0, cancelled: false };
          active.set(next.id, a);
          const p = execute(next, a).finally(() => {
            executions.delete(p);
            active.delete(next.id);
            void pump();
          });
          executions.add(p);
        }
      } while (again && !closed);
    })()
      .catch((err) => log.error("run_queue_pump_failed", { message: (err as Error).message }))
      .finally(() => {
        pumping = null;
        void checkIdle();
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
    let final: RunState;
    try {
      const result = await getPool().runMonteCarlo(run.netlist, run.limits, run.options as unknown as RunOptions, { signal: a.controller.signal, onProgress });
      await writing;
      final = (await saveResult(run, result)) ? "done" : "cancelled";
      if (final === "done") await mailLauncher(run, "done", result);
    } catch (err) {
      await writing;
      if (closed && !a.cancelled) {
        // Server stopping: leave the run for the next start.
        await runs().update({ id: run.id, state: "running" }, { state: "queued", startedAt: null, trialsDone: 0 }).catch(() => undefined);
        return;
      }
      if (a.cancelled || (err instanceof EngineError && err.code === "CANCELLED")) {
        final = "cancelled";
        await runs().update({ id: run.id, state: "running" }, { state: "cancelled", finishedAt: new Date() }).catch(() => undefined);
      } else {
        final = "failed";
        const code = err instanceof EngineError ? err.code : "INTERNAL";
        const message = err instanceof Error ? err.message : String(err);
        if (!(err instanceof EngineError)) log.error("run_failed", { runId: run.id, message, stack: (err as Error)?.stack });
        const res = await runs().update({ id: run.id, state: "running" }, { state: "failed", errorCode: code, errorMessage: message.slice(0, 1000), finishedAt: new Date(), trialsDone: a.done });
        if (res.affected === 1) await mailLauncher(run, "failed", undefined, message);
        else final = "cancelled";
      }
    }
    emit(run.id, { type: "end", state: final });
  }

  /** Run row and run_result in one transaction; false when the run is no longer `running`. */
  async function saveResult(run: Run, result: RunResult): Promise<boolean> {
    return dataSource.transaction(async (m) => {
      const res = await m.getRepository(Run).update(
        { id: run.id, state: "running" },
        {
          state: "done", trialsDone: result.trials, passed: result.passed, yieldFraction: result.yield,
          wilsonLow: result.wilson95[0], wilsonHigh: result.wilson95[1], finishedAt: new Date(), errorCode: null, errorMessage: null,
        },
      );
      if (res.affected !== 1) return false;
      await m.getRepository(RunResultRow).delete({ runId: run.id });
      await m.getRepository(RunResultRow).save(m.getRepository(RunResultRow).create({ runId: run.id, result: toStoredResult(result) }));
      return true;
    });
  }

  async function mailLauncher(run: Run, outcome: "done" | "failed", result?: RunResult, reason?: string): Promise<void> {
    try {
      const [user, design, revision] = await Promise.all([
        dataSource.getRepository(User).findOneBy({ id: run.launchedById }),
        dataSource.getRepository(Design).findOneBy({ id: run.designId }),
        dataSource.getRepository(DesignRevision).findOneBy({ id: run.revisionId }),
      ]);
      if (!user) return;
      const what = `${design?.name ?? "design"} r${revision?.number ?? "?"}${run.label ? ` (${run.label})` : ""}`;
      const link = `${deps.config.publicOrigin}/runs/${run.id}`;
      const subject = outcome === "done" ? `Run finished: ${what} — yield ${(100 * result!.yield).toFixed(1)} %` : `Run failed: ${what}`;
      const body = outcome === "done"
        ? `Your run of ${what} finished: ${result!.passed} of ${result!.trials} trials passed, yield ${(100 * result!.yield).toFixed(1)} % ` +
          `(95 % interval ${(100 * result!.wilson95[0]).toFixed(1)} – ${(100 * result!.wilson95[1]).toFixed(1)} %).`
        : `Your run of ${what} failed: ${reason}`;
      await deps.mailer.send({ to: user.email, subject, text: `${body}\n\nOpen it: ${link}\n\n— Lotwise\nLotwise estimates; it does not certify.` });
    } catch (err) {
      log.error("mail_failed", { kind: `run_${outcome}`, runId: run.id, message: (err as Error).message });
    }
  }

  return {
    get pool() {
      return getPool();
    },
    maxRunning,
    async start() {
      await runs().update({ state: "running" }, { state: "queued", startedAt: null, trialsDone: 0 });
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
      for (const a of active.values()) a.controller.abort();
      await pumping;
      await Promise.allSettled([...executions]);
      idleWaiters.splice(0).forEach((w) => w());
      await created?.close();
    },
  };
}
