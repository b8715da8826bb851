/**
 * A real Lotwise server process (`node --import tsx server/index.ts`) on a database of the test MariaDB, for tests that
 * kill it: the same start-up as `npm start`'s server (settings from the environment, migrations, run queue).
 */
import { spawn, type ChildProcess } from "node:child_process";
import { randomBytes, randomUUID } from "node:crypto";
import mysql from "mysql2/promise";
import type { DataSource } from "typeorm";
import { hashPassword } from "../../server/auth/passwords";
import { loadConfig } from "../../server/config/env";
import { createDataSource, openAndMigrate } from "../../server/db/data-source";
import { User } from "../../server/entities";
import type { Role } from "../../shared/roles";
import { freePort, until } from "./distributed";

export interface ServerProcess {
  child: ChildProcess;
  origin: string;
  output(): string;
  /** resolves once it has exited */
  exited: Promise<void>;
}

/**
 * Starts one on database `dbName` with one worker thread and one run at a time; `env` adds or overrides settings
 * (e.g. LOTWISE_REDIS_URL for distributed mode). Resolves once /api/health answers.
 */
export async function startServerProcess(dbName: string, env: Record<string, string> = {}): Promise<ServerProcess> {
  const port = await freePort();
  const origin = `http://127.0.0.1:${port}`;
  let output = "";
  const child = spawn(process.execPath, ["--import", "tsx", "server/index.ts"], {
    cwd: process.cwd(),
    env: {
      ...process.env, NODE_ENV: "test", LOTWISE_HOST: "127.0.0.1", LOTWISE_PORT: String(port), LOTWISE_PUBLIC_ORIGIN: origin,
      LOTWISE_DB_NAME: dbName, LOTWISE_WORKERS: "1", LOTWISE_MAX_RUNNING: "1", LOTWISE_CLIENT_DIR: ".tmp/no-client",
      LOTWISE_MAIL_SINK_PORT: "9", LOTWISE_LOG_LEVEL: "warn", ...env,
    },
    stdio: ["ignore", "pipe", "pipe"],
  });
  const exited = new Promise<void>((r) => child.once("exit", () => r()));
  child.stdout!.on("data", (d) => (output += d));
  child.stderr!.on("data", (d) => (output += d));
  await until("the server to listen", async () => {
    if (child.exitCode !== null) throw new Error(`server exited: ${output}`);
    return (await fetch(`${origin}/api/health`)).ok;
  }, 30_000).catch((err: Error) => {
    child.kill("SIGKILL");
    throw new Error(`${err.message}\n${output}`);
  });
  return { child, origin, output: () => output, exited };
}

/** Signs in over HTTP and returns the Cookie header to send. */
export async function signInCookie(origin: string, email: string, password: string): Promise<string> {
  const res = await fetch(`${origin}/api/auth/sign-in`, {
    method: "POST", headers: { "content-type": "application/json", origin }, body: JSON.stringify({ email, password }),
  });
  if (res.status !== 200) throw new Error(`sign-in answered ${res.status}: ${await res.text()}`);
  return res.headers.getSetCookie().map((c) => c.split(";")[0]).join("; ");
}

/** A scratch database on the test MariaDB for server processes: created and migrated, one account in it; drop() removes it. */
export interface ScratchDatabase {
  dbName: string;
  ds: DataSource;
  user: User;
  drop(): Promise<void>;
}

export async function createScratchDatabase(prefix: string, person: { email: string; name: string; roles: Role[]; password: string }): Promise<ScratchDatabase> {
  if (!process.env.LOTWISE_TEST_DB_READY) throw new Error("run through `npm test`");
  const base = loadConfig(process.env);
  const dbName = `${prefix}_${process.pid}_${randomBytes(3).toString("hex")}`;
  const admin = await mysql.createConnection({ host: base.db.host, port: base.db.port, user: base.db.user, password: base.db.password });
  await admin.query(`CREATE DATABASE \`${dbName}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  await admin.end();
  const ds = createDataSource({ ...base.db, name: dbName }, { poolSize: 3 });
  await openAndMigrate(ds);
  const user = ds.getRepository(User).create({
    id: randomUUID(), email: person.email, name: person.name, roles: person.roles, active: true, passwordHash: await hashPassword(person.password),
  });
  await ds.getRepository(User).insert(user);
  return {
    dbName,
    ds,
    user,
    async drop() {
      if (!ds.isInitialized) return;
      await ds.query(`DROP DATABASE \`${dbName}\``);
      await ds.destroy();
    },
  };
}
