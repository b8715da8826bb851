/**
 * The run dispatcher: where the trials of a run are computed. Two modes behind one interface:
 *
 * - embedded (default): the server's own piscina pool (trial-pool.ts);
 * - distributed (LOTWISE_REDIS_URL set): chunk jobs on BullMQ over Redis, computed by `npm run worker` processes on
 *   any host that reaches Redis (distributed-dispatcher.ts).
 *
 * Either way the run queue (services/run-queue.ts) holds queued runs in MariaDB and stores results there, and the
 * same inputs and seed give a byte-identical result: chunk aggregates merge exactly and the run is finalized in the
 * server from the merged total.
 */
import type { DispatchHealth } from "../../shared/contracts/system";
import type { Netlist } from "../../shared/engine/netlist";
import type { RunResult } from "../../shared/engine/result";
import type { RunOptions } from "../../shared/engine/run-options";
import type { Logger } from "../logger";
import { createDistributedDispatcher } from "./distributed-dispatcher";
import { createTrialPool, type RunControls } from "../../workers/trial-pool";

export { ServerStopping } from "../../workers/trial-pool";

/** What health reports of the dispatcher. */
export type DispatchStatus = DispatchHealth;

/** Per-run controls; `runId` names the run's chunk jobs in distributed mode (a random id when absent). */
export interface DispatchControls extends RunControls {
  runId?: string;
}

export interface RunDispatcher {
  readonly mode: "embedded" | "distributed";
  runMonteCarlo(netlist: Netlist, limits: unknown, options: RunOptions, controls?: DispatchControls): Promise<RunResult>;
  status(): Promise<DispatchStatus>;
  close(): Promise<void>;
}

/** The embedded dispatcher: a piscina pool of `size` threads in this process. */
export function createEmbeddedDispatcher(options: { size?: number; chunkSize?: number; log?: Logger } = {}): RunDispatcher {
  const pool = createTrialPool(options);
  return {
    mode: "embedded",
    runMonteCarlo: (netlist, limits, runOptions, controls) => pool.runMonteCarlo(netlist, limits, runOptions, controls),
    status: async () => ({ mode: "embedded", threads: pool.size }),
    close: () => pool.close(),
  };
}

/** The dispatcher the settings ask for: distributed when a Redis URL is set, else embedded. */
export function createDispatcher(config: { redisUrl?: string; workers?: number; redisOutageSeconds?: number; noWorkersSeconds?: number }, log?: Logger): RunDispatcher {
  if (!config.redisUrl) return createEmbeddedDispatcher({ size: config.workers, log });
  return createDistributedDispatcher({
    redisUrl: config.redisUrl,
    outageMs: config.redisOutageSeconds === undefined ? undefined : config.redisOutageSeconds * 1000,
    noWorkersMs: config.noWorkersSeconds === undefined ? undefined : config.noWorkersSeconds * 1000,
    log,
  });
}
