/**
 * `lotwise synth …`, `lotwise match …` and `lotwise snap VALUE --series E24`.
 * synth and match print a netlist; snap prints { value, error }.
 */
import { parseArgs } from "node:util";
import { snapToSeries } from "../../shared/engine/e-series";
import { E_SERIES_NAMES, type ESeriesName, type Netlist } from "../../shared/engine/netlist";
import { designLMatch, synthesizeLadder, type LadderSpec } from "../../shared/engine/synthesis/index";
import { formatSi } from "../../shared/units";
import { choiceOption, CliUsageError, help, intOption, printJson, requireOption, siOption } from "./cli-support";

export const SYNTH_HELP = `Usage: lotwise synth --family butterworth|chebyshev|bessel --type lowpass|highpass|bandpass|bandstop
                     --order N (--cutoff HZ | --low HZ --high HZ) [--ripple DB] [--z0 OHM] [--first shunt|series] [--json]

Doubly terminated all-pole ladder as a Lotwise netlist (SI prefixes allowed: 100M, 2G).`;

export const MATCH_HELP = `Usage: lotwise match --source-r OHM --load-r OHM --freq HZ [--form lowpass|highpass] [--json]

L-section match between two resistances; port 1 is the source side.`;

export const SNAP_HELP = `Usage: lotwise snap VALUE --series E3|E6|E12|E24|E48|E96|E192 [--json]

Nearest preferred value (log scale, across decades) and the relative error (snapped − value)/value.`;

const FAMILIES = ["butterworth", "chebyshev", "bessel"] as const;
const TYPES = ["lowpass", "highpass", "bandpass", "bandstop"] as const;

/** synth command; returns the exit code. */
export function synthCommand(args: string[]): number {
  const { values, positionals } = parseArgs({
    args, allowPositionals: false, strict: true,
    options: {
      family: { type: "string" }, type: { type: "string" }, order: { type: "string" }, cutoff: { type: "string" },
      low: { type: "string" }, high: { type: "string" }, ripple: { type: "string" }, z0: { type: "string" },
      first: { type: "string" }, json: { type: "boolean" }, help: { type: "boolean", short: "h" },
    },
  });
  void positionals;
  if (values.help) return help(SYNTH_HELP);
  const family = choiceOption(values, "family", FAMILIES);
  const type = choiceOption(values, "type", TYPES);
  const order = intOption(values, "order");
  if (!family || !type || order === undefined) throw new CliUsageError("synth needs --family, --type and --order");
  const spec: LadderSpec = { family, type, order };
  const cutoff = siOption(values, "cutoff");
  const low = siOption(values, "low");
  const high = siOption(values, "high");
  if (type === "lowpass" || type === "highpass") {
    if (cutoff === undefined) throw new CliUsageError(`--type ${type} needs --cutoff HZ`);
    spec.cutoff = cutoff;
  } else {
    if (low === undefined || high === undefined) throw new CliUsageError(`--type ${type} needs --low HZ and --high HZ`);
    spec.low = low;
    spec.high = high;
  }
  const ripple = siOption(values, "ripple");
  if (ripple !== undefined) spec.rippleDb = ripple;
  if (family === "chebyshev" && ripple === undefined) throw new CliUsageError("--family chebyshev needs --ripple DB");
  const z0 = siOption(values, "z0");
  if (z0 !== undefined) spec.z0 = z0;
  const first = choiceOption(values, "first", ["shunt", "series"] as const);
  if (first) spec.first = first;
  return printNetlist(synthesizeLadder(spec), values.json === true);
}

/** match command; returns the exit code. */
export function matchCommand(args: string[]): number {
  const { values } = parseArgs({
    args, allowPositionals: false, strict: true,
    options: { "source-r": { type: "string" }, "load-r": { type: "string" }, freq: { type: "string" }, form: { type: "string" }, json: { type: "boolean" }, help: { type: "boolean", short: "h" } },
  });
  if (values.help) return help(MATCH_HELP);
  const sourceR = siOption(values, "source-r");
  const loadR = siOption(values, "load-r");
  const freq = siOption(values, "freq");
  if (sourceR === undefined || loadR === undefined || freq === undefined) throw new CliUsageError("match needs --source-r, --load-r and --freq");
  const form = choiceOption(values, "form", ["lowpass", "highpass"] as const);
  return printNetlist(designLMatch(form ? { sourceR, loadR, freq, form } : { sourceR, loadR, freq }), values.json === true);
}

/** snap command; returns the exit code. */
export function snapCommand(args: string[]): number {
  const { values, positionals } = parseArgs({
    args, allowPositionals: true, strict: true,
    options: { series: { type: "string" }, json: { type: "boolean" }, help: { type: "boolean", short: "h" } },
  });
  if (values.help) return help(SNAP_HELP);
  if (positionals.length !== 1) throw new CliUsageError("snap needs exactly one VALUE");
  const series = choiceOption(values, "series", E_SERIES_NAMES) ?? (requireOption(values, "series") as ESeriesName);
  const value = siOption({ value: positionals[0] }, "value") as number;
  const res = snapToSeries(value, series);
  if (values.json) printJson({ value: res.value, error: res.error });
  else process.stdout.write(`${formatSi(res.value)} (${series}), error ${(100 * res.error).toFixed(3)} %\n`);
  return 0;
}

function printNetlist(netlist: Netlist, json: boolean): number {
  if (json) {
    printJson(netlist);
    return 0;
  }
  const unit = { R: "Ω", L: "H", C: "F" } as const;
  const lines = [`${netlist.name ?? "netlist"}`, `ports: ${netlist.ports.map((p) => `${p.name} @ ${p.node} (${formatSi(p.z0, "Ω")})`).join(", ")}`];
  for (const p of netlist.parts) lines.push(`  ${p.ref.padEnd(6)} ${p.kind} ${p.nodes[0]}–${p.nodes[1]}  ${formatSi(p.value, unit[p.kind])}`);
  lines.push("(use --json for the netlist file)");
  process.stdout.write(`${lines.join("\n")}\n`);
  return 0;
}
