/**
 * Entry point of the lotwise command line (see cli-app.ts for commands and exit codes).
 * Run as `npm run lotwise -- <command> …`, `tsx server/cli/main.ts …` or the `lotwise` bin.
 */
import { main } from "./cli-app";

main(process.argv.slice(2)).then(
  (code) => {
    process.exitCode = code;
  },
  (err: unknown) => {
    process.stderr.write(`lotwise: unexpected failure: ${err instanceof Error ? err.message : String(err)}\n`);
    process.exitCode = 1;
  },
);
