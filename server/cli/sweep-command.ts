/**
 * `lotwise sweep NETLIST --from HZ --to HZ --points N [--scale log|lin] [--json]`
 * JSON: { freq, s21_db, s11_db, s21_deg, s11_deg, gd21_ns } (+ sIJ_db for every pair with > 2 ports).
 */
import { parseArgs } from "node:util";
import { buildFrequencyGrid } from "../../shared/engine/frequency-grid";
import type { Netlist } from "../../shared/engine/netlist";
import { compileNetlist, createSweepEvaluator, nominalValues, sParamDb, sParamDeg } from "../../shared/engine/solver";
import { netlistSchema } from "../../shared/schemas/netlist";
import { formatSi } from "../../shared/units";
import { checkWithSchema, choiceOption, CliUsageError, fmt, help, intOption, printJson, readJsonInput, siOption } from "./cli-support";

export const SWEEP_HELP = `Usage: lotwise sweep NETLIST --from HZ --to HZ --points N [--scale log|lin] [--json]

Nominal response of a netlist (JSON file, or - for stdin).
  --from HZ, --to HZ   sweep range (SI prefixes allowed: 1M, 2.5G)
  --points N           number of points, 2..10001
  --scale log|lin      spacing (default log)
  --json               print { freq, s21_db, s11_db, s21_deg, s11_deg, gd21_ns, ... }`;

/** Runs the sweep command; returns the exit code. */
export function sweepCommand(args: string[]): number {
  const { values, positionals } = parseArgs({
    args, allowPositionals: true, strict: true,
    options: { from: { type: "string" }, to: { type: "string" }, points: { type: "string" }, scale: { type: "string" }, json: { type: "boolean" }, help: { type: "boolean", short: "h" } },
  });
  if (values.help) return help(SWEEP_HELP);
  if (positionals.length !== 1) throw new CliUsageError("sweep needs exactly one NETLIST file (or -)");
  const from = siOption(values, "from");
  const to = siOption(values, "to");
  const points = intOption(values, "points");
  if (from === undefined || to === undefined || points === undefined) throw new CliUsageError("sweep needs --from, --to and --points");
  const scale = choiceOption(values, "scale", ["log", "lin"] as const) ?? "log";
  const netlist = checkWithSchema(netlistSchema, readJsonInput(positionals[0], "netlist", { used: false }), "netlist") as Netlist;
  const compiled = compileNetlist(netlist);
  const grid = buildFrequencyGrid({ from, to, points, scale });
  const buf = createSweepEvaluator(compiled, grid.freqs).evaluate(nominalValues(compiled), 25);
  const P = compiled.portCount;
  const out: Record<string, number[]> = {
    freq: Array.from(grid.freqs),
    s21_db: Array.from(sParamDb(buf, 1, 0)),
    s11_db: Array.from(sParamDb(buf, 0, 0)),
    s21_deg: Array.from(sParamDeg(buf, 1, 0)),
    s11_deg: Array.from(sParamDeg(buf, 0, 0)),
    gd21_ns: Array.from(grid.freqs, (_, f) => buf.gd[(f * P + 1) * P] * 1e9),
  };
  if (P > 2) for (let i = 0; i < P; i++) for (let j = 0; j < P; j++) out[`s${i + 1}${j + 1}_db`] = Array.from(sParamDb(buf, i, j));
  if (values.json) {
    printJson(out);
    return 0;
  }
  const lines = [`${netlist.name ?? "netlist"}: ${P} ports, ${netlist.parts.length} parts, ${points} points (${scale})`, "freq          S21 dB     S11 dB    S21 deg     GD21 ns"];
  out.freq.forEach((f, k) => {
    lines.push(`${formatSi(f, "Hz").padEnd(12)} ${fmt(out.s21_db[k], 5).padStart(9)} ${fmt(out.s11_db[k], 5).padStart(10)} ${fmt(out.s21_deg[k], 5).padStart(10)} ${fmt(out.gd21_ns[k], 5).padStart(11)}`);
  });
  process.stdout.write(`${lines.join("\n")}\n`);
  return 0;
}
