import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { existsSync, mkdirSync, openSync, readFileSync, rmSync } from "node:fs";
import { resolve } from "node:path";

export interface MariaDb {
  port: number;
  socket: string;
  /** the server's process id */
  pid: number;
  /** True when this process started the server. Only then does `stop()` stop it: a server adopted from elsewhere is someone else's. */
  startedHere: boolean;
  /** Runs SQL as the socket-authenticated root. */
  sql(statements: string): void;
  /** Stops the server if this process started it (SIGTERM by pid, SIGKILL after 30 s); an adopted server is left running. */
  stop(): Promise<void>;
}

const sbin = (name: string) => (existsSync(`/usr/sbin/${name}`) ? `/usr/sbin/${name}` : name);
const bin = (name: string) => (existsSync(`/usr/bin/${name}`) ? `/usr/bin/${name}` : name);

/**
 * Servers this process started and has not seen stop, by pid. mariadbd runs in a session of its own (setsid), so
 * Ctrl-C in the terminal never reaches it: whoever started it must stop it by pid, and nobody else may.
 */
const started = new Map<number, { dir: string; answers: () => boolean }>();

/**
 * Starts a private MariaDB on 127.0.0.1:`port` with its data in `dir` (created on first use, reused after).
 * `--no-defaults` first so /etc/mysql is never read; absolute paths only (a relative --datadir resolves under /usr). A stale pid file is cleared;
 * a server still running from an earlier start on the same folder is adopted (and never stopped by this process).
 * The server is registered as started here the moment it is spawned, so `stopStartedMariaDbs` reaches it even when
 * the start is interrupted; `signal` aborted before the spawn means nothing is started.
 */
export async function startMariaDb(options: { dir: string; port: number; signal?: AbortSignal }): Promise<MariaDb> {
  const dir = resolve(options.dir);
  const dataDir = `${dir}/data`;
  const runDir = `${dir}/run`;
  const socket = `${runDir}/mysqld.sock`;
  const pidFile = `${runDir}/mysqld.pid`;
  const interrupted = () => new Error(`stopped while MariaDB in ${dir} was starting`);
  mkdirSync(runDir, { recursive: true });

  const ping = () => spawnSync(bin("mariadb-admin"), ["--no-defaults", `--socket=${socket}`, "-uroot", "--connect-timeout=2", "ping"], { stdio: "ignore" }).status === 0;
  const sql = (statements: string) => {
    const r = spawnSync(bin("mariadb"), ["--no-defaults", `--socket=${socket}`, "-uroot", "-e", statements], { encoding: "utf8" });
    if (r.status !== 0) throw new Error(`SQL failed: ${r.stderr.trim()}`);
    return r.stdout;
  };
  let pid = readPid(pidFile);
  let mine = false;
  if (pid && isAlive(pid)) {
    // Running already (an earlier start, or another Lotwise that is still starting it): wait for it to answer, then use it.
    const deadline = Date.now() + 60_000;
    while (!ping()) {
      if (!isAlive(pid)) throw new Error(`MariaDB (pid ${pid}) on ${dir} exited while starting; start again`);
      if (Date.now() > deadline) throw new Error(`MariaDB (pid ${pid}) runs on ${dir} but does not answer on ${socket}; stop it (kill ${pid}) and start again`);
      if (options.signal?.aborted) throw interrupted();
      await sleep(200);
    }
    const actual = Number(sql("SELECT @@port").split("\n")[1]);
    if (actual !== options.port) {
      throw new Error(`MariaDB already running on ${dir} (pid ${pid}) listens on port ${actual}, not ${options.port}: use LOTWISE_DB_PORT=${actual}, or stop it (kill ${pid})`);
    }
    console.log(`lotwise: reusing MariaDB already running from ${dir} (pid ${pid}); this process did not start it, so it leaves it running`);
  } else {
    if (pid) rmSync(pidFile, { force: true });
    rmSync(socket, { force: true });
    if (!existsSync(`${dataDir}/mysql`)) {
      console.log(`lotwise: creating MariaDB data folder ${dataDir}`);
      const init = spawnSync(bin("mariadb-install-db"), [
        "--no-defaults", "--user=root", `--datadir=${dataDir}`, "--auth-root-authentication-method=socket", "--skip-test-db", "--skip-name-resolve",
      ], { encoding: "utf8" });
      if (init.status !== 0) throw new Error(`mariadb-install-db failed:\n${init.stdout}\n${init.stderr}`);
    }
    if (options.signal?.aborted) throw interrupted();
    const log = openSync(`${dir}/mariadbd.out`, "a");
    const child: ChildProcess = spawn(sbin("mariadbd"), [
      "--no-defaults", "--user=root", `--datadir=${dataDir}`, `--socket=${socket}`, `--pid-file=${pidFile}`,
      `--port=${options.port}`, "--bind-address=127.0.0.1", "--skip-networking=0", "--skip-name-resolve",
      `--log-error=${dir}/error.log`, "--innodb-log-file-size=16M", "--innodb-buffer-pool-size=128M",
    ], { detached: true, stdio: ["ignore", log, log] });
    child.unref();
    if (child.pid === undefined) throw new Error(`could not start ${sbin("mariadbd")}`);
    pid = child.pid;
    mine = true;
    started.set(pid, { dir, answers: ping });
    let exited = false;
    child.once("exit", () => {
      exited = true;
      started.delete(child.pid!);
    });
    const deadline = Date.now() + 60_000;
    while (!ping()) {
      if (exited || Date.now() > deadline) {
        const tail = existsSync(`${dir}/error.log`) ? readFileSync(`${dir}/error.log`, "utf8").split("\n").slice(-15).join("\n") : "";
        throw new Error(`MariaDB did not start on port ${options.port}${exited ? " (it exited)" : ""}. Its log ends:\n${tail}`);
      }
      if (options.signal?.aborted) throw interrupted();
      await sleep(200);
    }
  }

  const serverPid = pid;
  return {
    port: options.port,
    socket,
    pid: serverPid,
    startedHere: mine,
    sql(statements) {
      sql(statements);
    },
    async stop() {
      if (mine) await stopPids([serverPid]);
    },
  };
}

/**
 * Stops every MariaDB this process started and that still runs: SIGTERM (a clean shutdown), SIGKILL for any still
 * there after `graceMs` (default 30 s). Servers adopted from elsewhere are not touched.
 */
export async function stopStartedMariaDbs(options: { graceMs?: number } = {}): Promise<void> {
  await stopPids([...started.keys()], options.graceMs);
}

/** Sends `signal` at once to every MariaDB this process started that still runs (for an exit that cannot wait). */
export function signalStartedMariaDbs(signal: NodeJS.Signals): void {
  for (const pid of started.keys()) {
    if (isAlive(pid)) {
      try {
        process.kill(pid, signal);
      } catch {
        // gone meanwhile
      }
    } else started.delete(pid);
  }
}

/**
 * SIGTERM (a clean shutdown), then SIGKILL for any still there after `graceMs`. A server still starting is first
 * given up to 20 s to answer: mariadbd can miss a SIGTERM that arrives early in its start, and then hangs, ignoring
 * every later one.
 */
async function stopPids(pids: number[], graceMs = 30_000): Promise<void> {
  const signal = (pid: number, sig: NodeJS.Signals) => {
    try {
      if (isAlive(pid)) process.kill(pid, sig);
    } catch {
      // gone meanwhile
    }
  };
  let deadline = Date.now() + 20_000;
  for (const pid of pids) {
    const answers = started.get(pid)?.answers;
    while (answers && isAlive(pid) && !answers() && Date.now() < deadline) await sleep(200);
  }
  for (const pid of pids) signal(pid, "SIGTERM");
  deadline = Date.now() + graceMs;
  while (pids.some(isAlive) && Date.now() < deadline) await sleep(100);
  for (const pid of pids) signal(pid, "SIGKILL");
  deadline = Date.now() + 5000;
  while (pids.some(isAlive) && Date.now() < deadline) await sleep(50);
  for (const pid of pids) if (!isAlive(pid)) started.delete(pid);
}

/** Creates a database and a loopback user for it (idempotent). `everything` grants all databases (test server only). */
export function ensureDatabase(db: MariaDb, options: { name: string; user: string; password: string; everything?: boolean }): void {
  const pw = options.password.replace(/'/g, "''");
  const scope = options.everything ? "*.*" : `\`${options.name}\`.*`;
  db.sql(
    `CREATE DATABASE IF NOT EXISTS \`${options.name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;` +
      `CREATE USER IF NOT EXISTS '${options.user}'@'127.0.0.1' IDENTIFIED BY '${pw}';` +
      `ALTER USER '${options.user}'@'127.0.0.1' IDENTIFIED BY '${pw}';` +
      `GRANT ALL PRIVILEGES ON ${scope} TO '${options.user}'@'127.0.0.1';`,
  );
}

function readPid(file: string): number | null {
  if (!existsSync(file)) return null;
  const pid = Number.parseInt(readFileSync(file, "utf8").trim(), 10);
  return Number.isInteger(pid) && pid > 0 ? pid : null;
}

function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
  } catch {
    return false;
  }
  try {
    return readFileSync(`/proc/${pid}/cmdline`, "utf8").includes("mariadbd");
  } catch {
    return true;
  }
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
