/** Structured log lines (one JSON object per line on stderr). Never pass secrets, tokens or passwords in `fields`. */
export interface Logger {
  info(event: string, fields?: Record<string, unknown>): void;
  warn(event: string, fields?: Record<string, unknown>): void;
  error(event: string, fields?: Record<string, unknown>): void;
}

const LEVELS = { info: 1, warn: 2, error: 3, silent: 4 } as const;

export function createLogger(level: keyof typeof LEVELS = (process.env.LOTWISE_LOG_LEVEL as keyof typeof LEVELS) ?? "info"): Logger {
  const threshold = LEVELS[level] ?? LEVELS.info;
  const write = (lvl: "info" | "warn" | "error", event: string, fields?: Record<string, unknown>) => {
    if (LEVELS[lvl] < threshold) return;
    process.stderr.write(`${JSON.stringify({ time: new Date().toISOString(), level: lvl, event, ...fields })}\n`);
  };
  return {
    info: (event, fields) => write("info", event, fields),
    warn: (event, fields) => write("warn", event, fields),
    error: (event, fields) => write("error", event, fields),
  };
}
