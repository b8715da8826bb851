#!/usr/bin/env node
// The `lotwise` command: registers tsx (with the project's tsconfig) and runs the TypeScript CLI.
import { fileURLToPath } from "node:url";
import { register } from "tsx/esm/api";

register({ tsconfig: fileURLToPath(new URL("../tsconfig.json", import.meta.url)) });
await import("../server/cli/main.ts");
