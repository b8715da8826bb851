/**
 * The lotwise command line (entry: main.ts): `npm run lotwise -- <command> …` or the `lotwise` bin.
 * Commands: sweep, run, synth, match, snap; each takes --help and --json.
 * Exit codes: 0 success, 1 bad input data or an engine error, 2 wrong usage. Errors print one line
 * on stderr ("lotwise: …"), never a stack trace.
 */
import { describeError } from "./cli-support";
import { matchCommand, MATCH_HELP, snapCommand, SNAP_HELP, synthCommand, SYNTH_HELP } from "./design-commands";
import { runCommand, RUN_HELP } from "./run-command";
import { sweepCommand, SWEEP_HELP } from "./sweep-command";

const HELP = `Usage: lotwise <command> [options]

Commands:
  sweep NETLIST --from HZ --to HZ --points N      nominal S-parameters and group delay
  run NETLIST --limits LIMITS --trials N --seed S Monte Carlo yield against acceptance limits
  synth --family F --type T --order N ...          all-pole ladder netlist
  match --source-r OHM --load-r OHM --freq HZ      L-section matching netlist
  snap VALUE --series E24                          nearest preferred value

Run "lotwise <command> --help" for a command's options. Add --json for machine-readable output.`;

const COMMANDS: Record<string, { run: (args: string[]) => number | Promise<number>; help: string }> = {
  sweep: { run: sweepCommand, help: SWEEP_HELP },
  run: { run: runCommand, help: RUN_HELP },
  synth: { run: synthCommand, help: SYNTH_HELP },
  match: { run: matchCommand, help: MATCH_HELP },
  snap: { run: snapCommand, help: SNAP_HELP },
};

/** Runs the CLI with the given arguments; resolves to the exit code. */
export async function main(argv: string[]): Promise<number> {
  const [name, ...rest] = argv;
  if (name === undefined || name === "--help" || name === "-h" || name === "help") {
    process.stdout.write(`${HELP}\n`);
    return name === undefined ? 2 : 0;
  }
  const command = COMMANDS[name];
  if (!command) {
    process.stderr.write(`lotwise: unknown command "${name}" (use sweep, run, synth, match or snap; see lotwise --help)\n`);
    return 2;
  }
  try {
    return await command.run(rest);
  } catch (err) {
    const { message, exitCode } = describeError(err);
    process.stderr.write(`lotwise ${name}: ${message}${exitCode === 2 ? ` (see lotwise ${name} --help)` : ""}\n`);
    return exitCode;
  }
}

