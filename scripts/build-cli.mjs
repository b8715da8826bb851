/**
 * Builds the `lotwise` command line ahead of time: esbuild bundles server/cli/main.ts and the piscina worker
 * workers/trials.worker.ts into git-ignored plain JavaScript under dist/cli/, so the CLI starts on Node alone
 * instead of transforming TypeScript through tsx on every start.
 *
 *   node scripts/build-cli.mjs           build when missing or older than its sources (prints what it did)
 *   node scripts/build-cli.mjs --force   build anyway
 *
 * The shim bin/lotwise.js calls ensureCliBundle() before each start, so a fresh clone or an edited source file
 * rebuilds by itself; `npm ci` (prepare) and scripts/stack.sh build it up front.
 *
 * Layout: the output keeps the source tree's shape (dist/cli/server/cli/main.js, dist/cli/workers/trials.worker.js),
 * and inside the bundles each project module's `import.meta.url` reads as the URL its own output would have in
 * that tree (dist/cli/workers/trial-pool.js for the trial pool). So `new URL("./trials.worker.js",
 * import.meta.url)` in workers/trial-pool.ts finds the bundled worker, and no source file needs to know
 * whether it runs bundled. Each command is a chunk of its own beside main.js (cli-app.ts imports commands when
 * called), so `--help` or `snap` loads neither piscina nor zod. piscina stays external: it starts its threads from its own worker.js in node_modules,
 * and `move()` in the worker must be the same module instance piscina's thread uses.
 *
 * Staleness: dist/cli/inputs.json, written last, lists every project file esbuild read (from its metafile) plus
 * package-lock.json and this script, and when the build started; the bundle is stale when that file or an output is
 * missing, or when any input is gone or was modified after the build started.
 * Each file is written to a temporary name and renamed, so two commands building at once never see half a file.
 */
import { mkdirSync, readdirSync, readFileSync, renameSync, rmSync, statSync, writeFileSync } from "node:fs";
import { performance } from "node:perf_hooks";
import { basename, dirname, join, relative, sep } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

const root = fileURLToPath(new URL("..", import.meta.url));
const outRoot = join(root, "dist", "cli");
const stampFile = join(outRoot, "inputs.json");

/** Entry points, as paths from the repository root (a worker the CLI starts by file must be one of them). */
export const CLI_ENTRIES = ["server/cli/main.ts", "workers/trials.worker.ts"];

/** Where the bundled form of a source file lives: same path under dist/cli, extension .js. */
const outPathOf = (sourceRel) => join(outRoot, sourceRel.replace(/\.[cm]?tsx?$/, ".js"));

/** Name prefix of the code-split chunks written beside each entry. */
const CHUNK_PREFIX = "chunk-";

/** The bundled CLI's entry file. */
export const CLI_BUNDLE = outPathOf(CLI_ENTRIES[0]);

/** True when the bundle is missing or older than any file it was built from. */
export function isCliBundleStale() {
  let stamp;
  let inputs;
  try {
    let outputs;
    let entries;
    ({ startedAt: stamp, inputs, outputs, entries } = JSON.parse(readFileSync(stampFile, "utf8")));
    if (JSON.stringify(entries) !== JSON.stringify(CLI_ENTRIES)) return true;
    for (const out of outputs) statSync(join(outRoot, out)); // entries and their chunks
  } catch {
    return true;
  }
  if (typeof stamp !== "number" || !Array.isArray(inputs) || inputs.length === 0) return true;
  for (const rel of inputs) {
    try {
      if (statSync(join(root, rel)).mtimeMs > stamp) return true;
    } catch {
      return true; // a source file was moved or deleted
    }
  }
  return false;
}

/**
 * Bundles the CLI and its worker into dist/cli (see the header).
 * @param {{ quiet?: boolean }} [options] quiet: report errors only (the shim builds in front of a command's output)
 */
export async function buildCli(options = {}) {
  const esbuild = await import("esbuild");
  const startedAt = Date.now(); // a source saved while the build runs leaves the bundle stale
  const inputs = new Set(["package-lock.json", relative(root, fileURLToPath(import.meta.url))]);
  const outputs = [];
  // One build per entry: the import.meta.url rewrite is relative to the entry's own output file. Code split: each
  // dynamically imported command is a chunk beside its entry (same folder, so the rewrite holds for chunks too), so
  // a command loads only what it uses (cli-app.ts).
  for (const entry of CLI_ENTRIES) {
    const outfile = outPathOf(entry);
    const result = await esbuild.build({
      absWorkingDir: root,
      entryPoints: [entry],
      outdir: dirname(outfile),
      entryNames: "[name]",
      chunkNames: `${CHUNK_PREFIX}[name]-[hash]`,
      splitting: true,
      bundle: true,
      platform: "node",
      format: "esm",
      target: "node20",
      tsconfig: join(root, "tsconfig.json"),
      external: ["piscina"],
      // Bundled CommonJS packages may call require(); give the ESM output one.
      banner: { js: 'import { createRequire as __lotwiseCreateRequire } from "node:module"; const require = __lotwiseCreateRequire(import.meta.url);' },
      // Minified (names kept, for error names and stack lines): about half the bytes for Node to read and compile
      // on each start, most of them zod's.
      minify: true,
      keepNames: true,
      legalComments: "none",
      logLevel: options.quiet ? "error" : "warning",
      metafile: true,
      write: false,
      plugins: [moduleUrlPlugin(outfile)],
    });
    outputs.push(...result.outputFiles);
    for (const p of Object.keys(result.metafile.inputs)) if (!p.includes("node_modules/") && !p.startsWith("<")) inputs.add(p);
  }
  // Chunks before the entries that import them, so a command starting meanwhile never finds a missing chunk.
  const isChunk = (f) => basename(f.path).startsWith(CHUNK_PREFIX);
  for (const file of [...outputs.filter(isChunk), ...outputs.filter((f) => !isChunk(f))]) writeAtomically(file.path, file.contents);
  removeOldChunks(new Set(outputs.map((f) => f.path)));
  const list = [...inputs].map((p) => p.split(sep).join("/")).sort();
  const outList = outputs.map((f) => relative(outRoot, f.path).split(sep).join("/")).sort();
  writeAtomically(stampFile, `${JSON.stringify({ startedAt, entries: CLI_ENTRIES, outputs: outList, inputs: list }, null, 1)}\n`);
  return CLI_BUNDLE;
}

/** Builds the bundle when it is stale; resolves to the entry file's path. */
export async function ensureCliBundle() {
  if (isCliBundleStale()) await buildCli({ quiet: true });
  return CLI_BUNDLE;
}

/**
 * Replaces `import.meta.url` in each project module (not node_modules) by the URL of that module's place in the
 * output tree, relative to the bundle's own URL at run time (so the tree still works when moved as a whole).
 */
function moduleUrlPlugin(bundleFile) {
  return {
    name: "lotwise-module-url",
    setup(build) {
      build.onLoad({ filter: /\.[cm]?tsx?$/ }, (args) => {
        if (args.path.includes(`${sep}node_modules${sep}`)) return undefined;
        const text = readFileSync(args.path, "utf8");
        if (!text.includes("import.meta.url")) return undefined;
        const target = outPathOf(relative(root, args.path));
        const step = relative(dirname(bundleFile), target).split(sep).join("/");
        const expr = `new URL(${JSON.stringify(step.startsWith(".") ? step : `./${step}`)}, import.meta.url).href`;
        return { contents: text.replace(/\bimport\.meta\.url\b/g, `(${expr})`), loader: args.path.endsWith("x") ? "tsx" : "ts" };
      });
    },
  };
}

/** Chunks of earlier builds (other hashes) beside the entries. */
function removeOldChunks(keep) {
  for (const folder of new Set(CLI_ENTRIES.map((e) => dirname(outPathOf(e))))) {
    for (const name of readdirSync(folder)) {
      const path = join(folder, name);
      if (name.startsWith(CHUNK_PREFIX) && name.endsWith(".js") && !keep.has(path)) rmSync(path, { force: true });
    }
  }
}

function writeAtomically(path, contents) {
  mkdirSync(dirname(path), { recursive: true });
  const tmp = `${path}.${process.pid}.tmp`;
  writeFileSync(tmp, contents);
  renameSync(tmp, path);
}

if (process.argv[1] && pathToFileURL(process.argv[1]).href === import.meta.url) {
  const force = process.argv.includes("--force");
  const t0 = performance.now();
  if (!force && !isCliBundleStale()) {
    console.log(`lotwise: CLI bundle up to date (${relative(root, CLI_BUNDLE)})`);
  } else {
    await buildCli();
    console.log(`lotwise: built the CLI bundle ${relative(root, CLI_BUNDLE)} in ${Math.round(performance.now() - t0)} ms`);
  }
}
