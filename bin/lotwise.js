#!/usr/bin/env node
// The `lotwise` command: runs the CLI bundled ahead of time into dist/cli (scripts/build-cli.mjs), building it first
// when it is missing or older than its sources (a fresh clone, an edited file). Plain Node, no TypeScript transform
// at start-up. LOTWISE_CLI_SOURCE=1 runs server/cli/main.ts through tsx instead (as before the bundle).
import { fileURLToPath, pathToFileURL } from "node:url";

if (process.env.LOTWISE_CLI_SOURCE === "1") {
  const { register } = await import("tsx/esm/api");
  register({ tsconfig: fileURLToPath(new URL("../tsconfig.json", import.meta.url)) });
  await import("../server/cli/main.ts");
} else {
  const { ensureCliBundle } = await import("../scripts/build-cli.mjs");
  await import(pathToFileURL(await ensureCliBundle()).href);
}
