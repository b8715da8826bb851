/**
 * The lotwise command line (entry: main.ts): `npm run lotwise -- <command> …` or the `lotwise` bin.
 * Commands: sweep, run, synth, match, snap; each takes --help and --json.
 * Exit codes: 0 success, 1 bad input data or an engine error, 2 wrong usage. Errors print one line
 * on stderr ("lotwise: …"), never a stack trace.
 */
import { describeError } from "./cli-support";

const HELP = `Usage: lotwise <command> [options]

Commands:
  sweep NETLIST --from HZ --to HZ --points N      nominal S-parameters and group delay
  run NETLIST --limits LIMITS --trials N --seed S Monte Carlo yield against acceptance limits
  synth --family F --type T --order N ...          all-pole ladder netlist
  match --source-r OHM --load-r OHM --freq HZ      L-section matching netlist
  snap VALUE --series E24                          nearest preferred value

Run "lotwise <command> --help" for a command's options. Add --json for machine-readable output.`;

type Command = (args: string[]) => number | Promise<number>;

// Each command is loaded when it is called: the bundled CLI (scripts/build-cli.mjs) keeps every command in a chunk of
// its own, so `--help`, `snap` or `synth` never load the worker pool (piscina) or the schemas (zod) that `run` and
// `sweep` need, which is most of a start's time.
const COMMANDS: Record<string, () => Promise<Command>> = {
  sweep: async () => (await import("./sweep-command")).sweepCommand,
  run: async () => (await import("./run-command")).runCommand,
  synth: async () => (await import("./design-commands")).synthCommand,
  match: async () => (await import("./design-commands")).matchCommand,
  snap: async () => (await import("./design-commands")).snapCommand,
};

/** Runs the CLI with the given arguments; resolves to the exit code. */
export async function main(argv: string[]): Promise<number> {
  const [name, ...rest] = argv;
  if (name === undefined || name === "--help" || name === "-h" || name === "help") {
    process.stdout.write(`${HELP}\n`);
    return name === undefined ? 2 : 0;
  }
  const load = Object.hasOwn(COMMANDS, name) ? COMMANDS[name] : undefined;
  if (!load) {
    process.stderr.write(`lotwise: unknown command "${name}" (use sweep, run, synth, match or snap; see lotwise --help)\n`);
    return 2;
  }
  try {
    return await (await load())(rest);
  } catch (err) {
    const { message, exitCode } = describeError(err);
    process.stderr.write(`lotwise ${name}: ${message}${exitCode === 2 ? ` (see lotwise ${name} --help)` : ""}\n`);
    return exitCode;
  }
}

