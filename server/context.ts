import type { DataSource } from "typeorm";
import type { SessionService } from "./auth/sessions";
import type { SignInLimiter } from "./auth/sign-in-limiter";
import type { ServerConfig } from "./config/env";
import type { Logger } from "./logger";
import type { ExportPool } from "../workers/export-pool";
import type { Mailer } from "./mail/mailer";
import type { RunQueue } from "./services/run-queue";

/** What every route and service may use; built once per server (and once per test database). */
export interface AppContext {
  config: ServerConfig;
  dataSource: DataSource;
  sessions: SessionService;
  mailer: Mailer;
  limiter: SignInLimiter;
  log: Logger;
  /** Executes queued Monte Carlo runs on the server's trial pool (server/services/run-queue.ts). */
  runQueue: RunQueue;
  /** Replays and exports of stored runs, off the request thread (workers/export-pool.ts). */
  exportPool: ExportPool;
}
