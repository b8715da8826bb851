import { z } from "zod";

const port = z.coerce.number().int().min(1).max(65535);
const optionalText = z.string().trim().min(1).optional();

const envSchema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  LOTWISE_HOST: z.string().default("127.0.0.1"),
  LOTWISE_PORT: port.default(5180),
  LOTWISE_PUBLIC_ORIGIN: z.url().optional(),
  LOTWISE_DB_HOST: z.string().default("127.0.0.1"),
  LOTWISE_DB_PORT: port.default(3307),
  LOTWISE_DB_NAME: z.string().regex(/^[A-Za-z0-9_]{1,64}$/, "letters, digits and _ only").default("lotwise"),
  LOTWISE_DB_USER: z.string().regex(/^[A-Za-z0-9_]{1,32}$/, "letters, digits and _ only").default("lotwise"),
  LOTWISE_DB_PASSWORD: z.string().min(1).default("lotwise-local-db"),
  LOTWISE_SMTP_HOST: optionalText,
  LOTWISE_SMTP_PORT: port.optional(),
  LOTWISE_SMTP_USER: optionalText,
  LOTWISE_SMTP_PASSWORD: optionalText,
  LOTWISE_SMTP_SECURE: z.enum(["true", "false"]).default("false"),
  LOTWISE_MAIL_SINK_PORT: port.default(2525),
  LOTWISE_MAIL_FROM: z.string().default("Lotwise <lotwise@localhost>"),
  LOTWISE_WORKERS: z.coerce.number().int().min(1).max(64).optional(),
  LOTWISE_REDIS_URL: z.string().trim().optional().transform((v) => (v ? v : undefined)).superRefine((v, c) => {
    const problem = v === undefined ? null : redisUrlProblem(v);
    if (problem) c.addIssue({ code: "custom", message: problem });
  }),
  LOTWISE_REDIS_OUTAGE_S: z.coerce.number().int().min(1).max(86_400).default(60),
  LOTWISE_NO_WORKERS_S: z.coerce.number().int().min(1).max(86_400).default(600),
  LOTWISE_CLIENT_DIR: z.string().default("dist/client"),
  LOTWISE_LOG_LEVEL: z.enum(["info", "warn", "error", "silent"]).optional(),
});

export type ServerConfig = {
  env: "development" | "production" | "test";
  host: string;
  port: number;
  publicOrigin: string;
  db: { host: string; port: number; name: string; user: string; password: string };
  /** Real SMTP when `host` is set; otherwise mail goes to the local stand-in on `sinkPort`. */
  smtp: { host?: string; port?: number; user?: string; password?: string; secure: boolean; sinkPort: number };
  mailFrom: string;
  workers?: number;
  /** distributed mode (BullMQ on Redis) when set; embedded otherwise */
  redisUrl?: string;
  /** distributed mode: a run fails with QUEUE_UNAVAILABLE after Redis was unreachable this long */
  redisOutageSeconds: number;
  /** distributed mode: a run fails with NO_WORKERS after no worker process was connected this long */
  noWorkersSeconds: number;
  clientDir: string;
};

/**
 * Reads the server's settings from environment variables, with defaults for a local machine.
 * @throws Error listing every bad variable, e.g. "LOTWISE_PORT: Too big: expected number to be <=65535".
 */
export function loadConfig(env: NodeJS.ProcessEnv = process.env): ServerConfig {
  const parsed = envSchema.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((issue) => `  ${issue.path.join(".")}: ${issue.message}`);
    throw new Error(`Lotwise settings are not valid:\n${lines.join("\n")}`);
  }
  const e = parsed.data;
  return {
    env: e.NODE_ENV,
    host: e.LOTWISE_HOST,
    port: e.LOTWISE_PORT,
    publicOrigin: e.LOTWISE_PUBLIC_ORIGIN ?? `http://${e.LOTWISE_HOST}:${e.LOTWISE_PORT}`,
    db: { host: e.LOTWISE_DB_HOST, port: e.LOTWISE_DB_PORT, name: e.LOTWISE_DB_NAME, user: e.LOTWISE_DB_USER, password: e.LOTWISE_DB_PASSWORD },
    smtp: {
      host: e.LOTWISE_SMTP_HOST,
      port: e.LOTWISE_SMTP_PORT,
      user: e.LOTWISE_SMTP_USER,
      password: e.LOTWISE_SMTP_PASSWORD,
      secure: e.LOTWISE_SMTP_SECURE === "true",
      sinkPort: e.LOTWISE_MAIL_SINK_PORT,
    },
    mailFrom: e.LOTWISE_MAIL_FROM,
    workers: e.LOTWISE_WORKERS,
    redisUrl: e.LOTWISE_REDIS_URL,
    redisOutageSeconds: e.LOTWISE_REDIS_OUTAGE_S,
    noWorkersSeconds: e.LOTWISE_NO_WORKERS_S,
    clientDir: e.LOTWISE_CLIENT_DIR,
  };
}

/**
 * Checks a Redis URL (redis:// or rediss://, host required).
 * @returns the message when it is not one, else null
 */
export function redisUrlProblem(raw: string): string | null {
  let u: URL;
  try {
    u = new URL(raw);
  } catch {
    return "must be a URL such as redis://127.0.0.1:6390/";
  }
  if (u.protocol !== "redis:" && u.protocol !== "rediss:") return "must start with redis:// or rediss://";
  if (!u.hostname) return "must name a host";
  return null;
}
