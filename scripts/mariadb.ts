import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { existsSync, mkdirSync, openSync, readFileSync, rmSync } from "node:fs";
import { resolve } from "node:path";

export interface MariaDb {
  port: number;
  socket: string;
  /** Runs SQL as the socket-authenticated root. */
  sql(statements: string): void;
  stop(): Promise<void>;
}

const sbin = (name: string) => (existsSync(`/usr/sbin/${name}`) ? `/usr/sbin/${name}` : name);
const bin = (name: string) => (existsSync(`/usr/bin/${name}`) ? `/usr/bin/${name}` : name);

/**
 * Starts a private MariaDB on 127.0.0.1:`port` with its data in `dir` (created on first use, reused after).
 * `--no-defaults` first so /etc/mysql is never read; absolute paths only (a relative --datadir resolves under /usr). A stale pid file is cleared;
 * a server still running from an earlier start on the same folder is adopted.
 */
export async function startMariaDb(options: { dir: string; port: number }): Promise<MariaDb> {
  const dir = resolve(options.dir);
  const dataDir = `${dir}/data`;
  const runDir = `${dir}/run`;
  const socket = `${runDir}/mysqld.sock`;
  const pidFile = `${runDir}/mysqld.pid`;
  mkdirSync(runDir, { recursive: true });

  const ping = () => spawnSync(bin("mariadb-admin"), ["--no-defaults", `--socket=${socket}`, "-uroot", "ping"], { stdio: "ignore" }).status === 0;
  let pid = readPid(pidFile);
  if (pid && isAlive(pid) && ping()) {
    console.log(`lotwise: reusing MariaDB already running from ${dir} (pid ${pid})`);
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
    const log = openSync(`${dir}/mariadbd.out`, "a");
    const child: ChildProcess = spawn(sbin("mariadbd"), [
      "--no-defaults", "--user=root", `--datadir=${dataDir}`, `--socket=${socket}`, `--pid-file=${pidFile}`,
      `--port=${options.port}`, "--bind-address=127.0.0.1", "--skip-networking=0", "--skip-name-resolve",
      `--log-error=${dir}/error.log`, "--innodb-log-file-size=16M", "--innodb-buffer-pool-size=128M",
    ], { detached: true, stdio: ["ignore", log, log] });
    child.unref();
    let exited = false;
    child.once("exit", () => (exited = true));
    const deadline = Date.now() + 60_000;
    while (!ping()) {
      if (exited || Date.now() > deadline) {
        const tail = existsSync(`${dir}/error.log`) ? readFileSync(`${dir}/error.log`, "utf8").split("\n").slice(-15).join("\n") : "";
        throw new Error(`MariaDB did not start on port ${options.port}${exited ? " (it exited)" : ""}. Its log ends:\n${tail}`);
      }
      await sleep(200);
    }
    pid = readPid(pidFile) ?? child.pid ?? null;
  }

  return {
    port: options.port,
    socket,
    sql(statements) {
      const r = spawnSync(bin("mariadb"), ["--no-defaults", `--socket=${socket}`, "-uroot", "-e", statements], { encoding: "utf8" });
      if (r.status !== 0) throw new Error(`SQL failed: ${r.stderr.trim()}`);
    },
    async stop() {
      const current = readPid(pidFile) ?? pid;
      if (!current || !isAlive(current)) return;
      process.kill(current, "SIGTERM");
      const deadline = Date.now() + 30_000;
      while (isAlive(current) && Date.now() < deadline) await sleep(100);
      if (isAlive(current)) process.kill(current, "SIGKILL");
    },
  };
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
