import { createSessionService } from "./auth/sessions";
import { createSignInLimiter } from "./auth/sign-in-limiter";
import type { ServerConfig } from "./config/env";
import type { AppContext } from "./context";
import { createDataSource, openAndMigrate } from "./db/data-source";
import { createLogger, type Logger } from "./logger";
import { createMailer } from "./mail/mailer";

/** Opens the database (applying migrations) and builds everything the routes use. */
export async function createContext(config: ServerConfig, options: { log?: Logger } = {}): Promise<AppContext & { close(): Promise<void> }> {
  const log = options.log ?? createLogger();
  const dataSource = createDataSource(config.db);
  const ran = await openAndMigrate(dataSource);
  if (ran > 0) log.info("migrations_applied", { count: ran });
  const sessions = createSessionService(config.db, { secure: config.env === "production" });
  const mailer = createMailer(config);
  const ctx: AppContext = { config, dataSource, sessions, mailer, limiter: createSignInLimiter(), log };
  return {
    ...ctx,
    async close() {
      mailer.close();
      await sessions.close();
      await dataSource.destroy();
    },
  };
}
