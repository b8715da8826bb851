import { createSessionService } from "./auth/sessions";
import { createSignInLimiter } from "./auth/sign-in-limiter";
import type { ServerConfig } from "./config/env";
import type { AppContext } from "./context";
import { createDataSource, openAndMigrate } from "./db/data-source";
import { redactUrl } from "./engine/chunk-jobs";
import { createDispatcher } from "./engine/dispatcher";
import { createExportPool } from "../workers/export-pool";
import { createLogger, type Logger } from "./logger";
import { createMailer } from "./mail/mailer";
import { createRunQueue } from "./services/run-queue";

/**
 * How many runs execute at once: LOTWISE_MAX_RUNNING (integer 1..64), default 4 (at most one per person, sharing the
 * trial pool chunk by chunk: a person's small run starts beside another person's long one).
 * @throws Error naming the variable when it is not such an integer
 */
export const DEFAULT_MAX_RUNNING = 4;

export function maxRunningFromEnv(env: NodeJS.ProcessEnv = process.env): number {
  const raw = env.LOTWISE_MAX_RUNNING;
  if (raw === undefined || raw.trim() === "") return DEFAULT_MAX_RUNNING;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 1 || n > 64) throw new Error(`Lotwise settings are not valid:\n  LOTWISE_MAX_RUNNING: must be an integer 1..64 (got "${raw}")`);
  return n;
}

/**
 * Threads for replays and exports: LOTWISE_EXPORT_THREADS (integer 1..16), default 1.
 * @throws Error naming the variable when it is not such an integer
 */
export function exportThreadsFromEnv(env: NodeJS.ProcessEnv = process.env): number {
  const raw = env.LOTWISE_EXPORT_THREADS;
  if (raw === undefined || raw.trim() === "") return 1;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 1 || n > 16) throw new Error(`Lotwise settings are not valid:\n  LOTWISE_EXPORT_THREADS: must be an integer 1..16 (got "${raw}")`);
  return n;
}

/** Opens the database (applying migrations), builds everything the routes use and starts the run queue (re-queuing interrupted runs). */
export async function createContext(config: ServerConfig, options: { log?: Logger; maxRunning?: number } = {}): Promise<AppContext & { close(): Promise<void> }> {
  const log = options.log ?? createLogger();
  const maxRunning = options.maxRunning ?? maxRunningFromEnv();
  const dataSource = createDataSource(config.db);
  const ran = await openAndMigrate(dataSource);
  if (ran > 0) log.info("migrations_applied", { count: ran });
  const sessions = createSessionService(dataSource, { secure: config.env === "production" });
  const mailer = createMailer(config);
  const dispatcher = createDispatcher(config, log);
  if (dispatcher.mode === "distributed") log.info("run_dispatch_distributed", { redis: redactUrl(config.redisUrl!) });
  const runQueue = createRunQueue({ dataSource, mailer, log, config, dispatcher, maxRunning });
  const exportPool = createExportPool({ threads: exportThreadsFromEnv(), log, eager: true });
  const ctx: AppContext = { config, dataSource, sessions, mailer, limiter: createSignInLimiter(), log, runQueue, exportPool };
  await runQueue.start();
  return {
    ...ctx,
    async close() {
      await runQueue.close();
      await exportPool.close();
      mailer.close();
      await sessions.close();
      await dataSource.destroy();
    },
  };
}
