/**
 * `lotwise run NETLIST --limits LIMITS --trials N --seed S [--workers W] [--from HZ --to HZ --points N]
 *  [--scale log|lin] [--corners T1,T2] [--target-half-width H] [--chunk-size C] [--json] [--full]`
 * JSON: { trials, passed, yield, wilson95, clopperPearson95, ruleFailures, failingTrials }
 * (--full: the whole run result with histograms, envelopes, sensitivity and Cpk).
 */
import os from "node:os";
import { parseArgs } from "node:util";
import type { Netlist } from "../../shared/engine/netlist";
import type { RunResult } from "../../shared/engine/result";
import type { RunOptions } from "../../shared/engine/run-options";
import { limitsSchema } from "../../shared/schemas/limits";
import { netlistSchema } from "../../shared/schemas/netlist";
import { createTrialPool } from "../../workers/trial-pool";
import { checkWithSchema, choiceOption, CliUsageError, fmt, help, intOption, printJson, readJsonInput, siOption } from "./cli-support";

export const RUN_HELP = `Usage: lotwise run NETLIST --limits LIMITS --trials N --seed S [options]

Seeded Monte Carlo yield of a netlist against a limit set (JSON files; one of them may be -).
  --trials N               trials (or the cap with --target-half-width); 10k = 10000
  --seed S                 integer 0..2147483647 or any text
  --workers W              worker threads (default: number of cores)
  --from HZ --to HZ --points N [--scale log|lin]
                           sweep grid (default: 201 log points over the rules' bands)
  --corners T1,T2          temperature corners in °C (default 25)
  --target-half-width H    stop once the Wilson 95 % half-width is at most H (batches of 1000)
  --chunk-size C           trials per worker task (default 2500)
  --json                   print { trials, passed, yield, wilson95, clopperPearson95, ruleFailures, failingTrials }
  --full                   with --json: print the whole run result`;

/** Runs the run command; resolves to the exit code. */
export async function runCommand(args: string[]): Promise<number> {
  const { values, positionals } = parseArgs({
    args, allowPositionals: true, strict: true,
    options: {
      limits: { type: "string" }, trials: { type: "string" }, seed: { type: "string" }, workers: { type: "string" },
      from: { type: "string" }, to: { type: "string" }, points: { type: "string" }, scale: { type: "string" },
      corners: { type: "string" }, "target-half-width": { type: "string" }, "chunk-size": { type: "string" },
      json: { type: "boolean" }, full: { type: "boolean" }, help: { type: "boolean", short: "h" },
    },
  });
  if (values.help) return help(RUN_HELP);
  if (positionals.length !== 1) throw new CliUsageError("run needs exactly one NETLIST file (or -)");
  if (typeof values.limits !== "string") throw new CliUsageError("run needs --limits LIMITS");
  const trials = intOption(values, "trials");
  if (trials === undefined) throw new CliUsageError("run needs --trials N");
  if (typeof values.seed !== "string" || values.seed === "") throw new CliUsageError("run needs --seed S");
  const seed = /^\d+$/.test(values.seed) && Number(values.seed) <= 2147483647 ? Number(values.seed) : values.seed;
  const workers = intOption(values, "workers") ?? os.availableParallelism();
  if (workers < 1 || workers > 256) throw new CliUsageError("--workers must be 1..256");
  const chunkSize = intOption(values, "chunk-size");
  const options: RunOptions = { trials, seed };
  const from = siOption(values, "from");
  const to = siOption(values, "to");
  const points = intOption(values, "points");
  const scale = choiceOption(values, "scale", ["log", "lin"] as const);
  if (from !== undefined || to !== undefined || points !== undefined) {
    if (from === undefined || to === undefined) throw new CliUsageError("--from and --to go together");
    options.sweep = { from, to, points: points ?? 201, scale: scale ?? "log" };
  }
  if (typeof values.corners === "string") {
    const corners = values.corners.split(",").map((t) => Number(t.trim()));
    if (corners.some((t) => !Number.isFinite(t))) throw new CliUsageError("--corners must be a comma-separated list of °C values, e.g. -40,25,85");
    options.corners = corners;
  }
  const target = siOption(values, "target-half-width");
  if (target !== undefined) options.targetHalfWidth = target;

  const stdin = { used: false };
  const netlist = checkWithSchema(netlistSchema, readJsonInput(positionals[0], "netlist", stdin), "netlist") as Netlist;
  const limits = checkWithSchema(limitsSchema, readJsonInput(values.limits, "limits", stdin), "limits");
  const pool = createTrialPool({ size: workers, chunkSize });
  let result: RunResult;
  try {
    result = await pool.runMonteCarlo(netlist, limits, options);
  } finally {
    await pool.close();
  }
  if (values.json) {
    printJson(values.full ? result : {
      trials: result.trials, passed: result.passed, yield: result.yield, wilson95: result.wilson95,
      clopperPearson95: result.clopperPearson95, ruleFailures: result.ruleFailures, failingTrials: result.failingTrials,
    });
    return 0;
  }
  process.stdout.write(`${formatRun(result)}\n`);
  return 0;
}

function formatRun(r: RunResult): string {
  const pct = (x: number) => `${(100 * x).toFixed(2)} %`;
  const lines = [
    `yield ${pct(r.yield)} (${r.passed} of ${r.trials} trials, seed ${String(r.seed)}${r.stop.stoppedEarly ? `, stopped early at half-width ${fmt(r.halfWidth95, 3)}` : ""})`,
    `  95 % Wilson          ${pct(r.wilson95[0])} – ${pct(r.wilson95[1])}`,
    `  95 % Clopper–Pearson ${pct(r.clopperPearson95[0])} – ${pct(r.clopperPearson95[1])}`,
    "rules:",
  ];
  for (const rule of r.rules) {
    const limit = [rule.min !== undefined ? `min ${rule.min}` : "", rule.max !== undefined ? `max ${rule.max}` : ""].filter(Boolean).join(", ");
    lines.push(`  ${String(rule.index + 1).padStart(2)}. ${rule.label ?? rule.metric} ${rule.from}–${rule.to} Hz (${limit} ${rule.unit}): ${rule.failures} failures, nominal margin ${fmt(rule.nominalMargin)} ${rule.unit}, Cpk ${fmt(rule.cpk, 3)}`);
  }
  lines.push(`first failing trials: ${r.failingTrials.length ? r.failingTrials.join(", ") : "none"}`);
  return lines.join("\n");
}
