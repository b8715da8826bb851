import { randomBytes } from "node:crypto";
import { randomUUID } from "node:crypto";
import mysql from "mysql2/promise";
import request from "supertest";
import type { Express } from "express";
import { createApp } from "../../server/app";
import { hashPassword } from "../../server/auth/passwords";
import { createSessionService } from "../../server/auth/sessions";
import { createSignInLimiter } from "../../server/auth/sign-in-limiter";
import { loadConfig, type ServerConfig } from "../../server/config/env";
import type { AppContext } from "../../server/context";
import { createDataSource, openAndMigrate } from "../../server/db/data-source";
import { createEmbeddedDispatcher, type RunDispatcher } from "../../server/engine/dispatcher";
import { createExportPool } from "../../workers/export-pool";
import { OutboxMessage, User } from "../../server/entities";
import { createLogger } from "../../server/logger";
import { startMailSink } from "../../server/mail/mail-sink";
import { createMailer } from "../../server/mail/mailer";
import type { RouteInfo } from "../../server/routes/api-router";
import { createRunQueue } from "../../server/services/run-queue";
import type { Role } from "../../shared/roles";

export const TEST_PASSWORD = "correct horse battery staple";
export const ORIGIN = "http://127.0.0.1";

export interface TestContext {
  ctx: AppContext;
  app: Express;
  routes: RouteInfo[];
  config: ServerConfig;
  /** Adds an account directly (factory); password TEST_PASSWORD unless given. */
  buildUser(options?: { roles?: Role[]; email?: string; name?: string; active?: boolean; password?: string }): Promise<User>;
  /** A supertest agent signed in as a new account with these roles (cookies kept). */
  signedInAgent(roles: Role[]): Promise<{ agent: ReturnType<typeof request.agent>; user: User }>;
  /** Messages the mail stand-in stored, newest first. */
  outbox(): Promise<OutboxMessage[]>;
  close(): Promise<void>;
}

let counter = 0;

/**
 * A private database for one test file (created, migrated, dropped at close), a mail stand-in on a free loopback
 * port storing into it, and the real Express app over it. Needs the test MariaDB that `npm test` starts.
 */
export async function createTestContext(
  options: { limiter?: Parameters<typeof createSignInLimiter>[0]; /** runs at once (default 1) */ maxRunning?: number; /** trial pool threads (default 1) */ poolSize?: number;
    /** where runs are computed (default: an embedded pool of `poolSize` threads, started on the first run) */ dispatcher?: () => RunDispatcher;
  } = {},
): Promise<TestContext> {
  if (!process.env.LOTWISE_TEST_DB_READY) throw new Error("The integration tests need the test MariaDB: run them through `npm test`.");
  const base = loadConfig(process.env);
  const name = `lotwise_t_${process.pid}_${++counter}_${randomBytes(3).toString("hex")}`;
  const admin = await mysql.createConnection({ host: base.db.host, port: base.db.port, user: base.db.user, password: base.db.password });
  await admin.query(`CREATE DATABASE \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  await admin.end();

  const config: ServerConfig = { ...base, db: { ...base.db, name }, publicOrigin: ORIGIN, smtp: { ...base.smtp, host: undefined } };
  const dataSource = createDataSource(config.db, { poolSize: 4 });
  await openAndMigrate(dataSource);
  const sink = await startMailSink(dataSource, { port: 0 });
  config.smtp.sinkPort = sink.port;
  const sessions = createSessionService(dataSource, { secure: false });
  const mailer = createMailer(config);
  const log = createLogger("silent");
  // A small pool (one thread unless asked; started on the first run) or the given dispatcher, and a queue that starts at once, so a POSTed run completes.
  const runQueue = createRunQueue({ dataSource, mailer, log, config, dispatcher: options.dispatcher ?? (() => createEmbeddedDispatcher({ size: options.poolSize ?? 1 })), maxRunning: options.maxRunning ?? 1 });
  const exportPool = createExportPool({ log });
  const ctx: AppContext = { config, dataSource, sessions, mailer, limiter: createSignInLimiter(options.limiter), log, runQueue, exportPool };
  await runQueue.start();
  const { app, routes } = createApp(ctx);

  const buildUser: TestContext["buildUser"] = async (o = {}) => {
    const user = dataSource.getRepository(User).create({
      id: randomUUID(),
      email: o.email ?? `person-${randomBytes(4).toString("hex")}@lotwise.test`,
      name: o.name ?? "Test Person",
      roles: o.roles ?? ["designer"],
      active: o.active ?? true,
      passwordHash: await hashPassword(o.password ?? TEST_PASSWORD),
    });
    await dataSource.getRepository(User).insert(user);
    return user;
  };

  return {
    ctx,
    app,
    routes,
    config,
    buildUser,
    async signedInAgent(roles) {
      const user = await buildUser({ roles });
      const agent = request.agent(app);
      await agent.post("/api/auth/sign-in").set("Origin", ORIGIN).send({ email: user.email, password: TEST_PASSWORD }).expect(200);
      return { agent, user };
    },
    outbox: () => dataSource.getRepository(OutboxMessage).find({ order: { receivedAt: "DESC" } }),
    async close() {
      await runQueue.close();
      await exportPool.close();
      mailer.close();
      await sink.close();
      await sessions.close();
      await dataSource.query(`DROP DATABASE \`${name}\``);
      await dataSource.destroy();
    },
  };
}

/** The first http(s) link in a mail's text. */
export function linkIn(text: string): string {
  const match = text.match(/https?:\/\/\S+/);
  if (!match) throw new Error(`no link in mail:\n${text}`);
  return match[0];
}
