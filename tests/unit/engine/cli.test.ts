import { spawn } from "node:child_process";
import { existsSync, mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it, vi } from "vitest";
import { main } from "../../../server/cli/cli-app";

const root = join(import.meta.dirname, "../../..");
const dir = mkdtempSync(join(tmpdir(), "lotwise-cli-"));
const file = (name: string, data: unknown) => {
  const p = join(dir, name);
  writeFileSync(p, typeof data === "string" ? data : JSON.stringify(data));
  return p;
};

/** 3rd-order Butterworth pi low-pass, 50 ohm, fc = 100 MHz (docs/references.md §3 [C]). */
const net = file("net.json", {
  ports: [{ name: "in", node: "n1", z0: 50 }, { name: "out", node: "n2", z0: 50 }],
  parts: [
    { ref: "C1", kind: "C", nodes: ["n1", "gnd"], value: 31.831e-12, tolerance: 0.05 },
    { ref: "L2", kind: "L", nodes: ["n1", "n2"], value: 159.155e-9, tolerance: 0.05 },
    { ref: "C3", kind: "C", nodes: ["n2", "gnd"], value: 31.831e-12, tolerance: 0.05 },
  ],
});
const lim = file("lim.json", { rules: [{ metric: "s21_db", from: 1e6, to: 70e6, min: -0.8 }, { metric: "s21_db", from: 200e6, to: 1e9, max: -17.5 }] });

/** Spawns the CLI from its TypeScript source through tsx, or with `bin` through bin/lotwise.js (the bundle in dist/cli). */
function cli(args: string[], opts: { bin?: boolean; stdin?: string } = {}): Promise<{ code: number | null; stdout: string; stderr: string }> {
  const argv = opts.bin ? [join(root, "bin/lotwise.js"), ...args] : ["--import", "tsx", join(root, "server/cli/main.ts"), ...args];
  return new Promise((resolve) => {
    const child = spawn(process.execPath, argv, { cwd: root, stdio: ["pipe", "pipe", "pipe"] });
    let stdout = "";
    let stderr = "";
    child.stdout.on("data", (d) => (stdout += d));
    child.stderr.on("data", (d) => (stderr += d));
    child.stdin.end(opts.stdin ?? "");
    child.on("close", (code) => resolve({ code, stdout, stderr }));
  });
}

// Sequential, with room to spare: each test spawns tsx processes, which start slowly on a busy 2-core machine.
describe("lotwise CLI", { timeout: 180_000 }, () => {
  it("sweep --json prints the response arrays", async () => {
    const r = await cli(["sweep", net, "--from", "1M", "--to", "1G", "--points", "31", "--json"]);
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(Object.keys(out)).toEqual(["freq", "s21_db", "s11_db", "s21_deg", "s11_deg", "gd21_ns"]);
    expect(out.freq.length).toBe(31);
    // [C] Butterworth n = 3 at 1 GHz = 10 fc: IL = 10·log10(1 + 10^6) = 60.0 dB (docs/references.md §2 formula)
    expect(out.s21_db[30]).toBeCloseTo(-60, 2);
  });

  it("run --json is byte-identical with 1 and 2 workers and different chunk sizes; another seed differs", async () => {
    const base = ["run", net, "--limits", lim, "--trials", "3000", "--json"];
    const [a, b, c] = await Promise.all([
      cli([...base, "--seed", "5", "--workers", "1"]),
      cli([...base, "--seed", "5", "--workers", "2", "--chunk-size", "333"]),
      cli([...base, "--seed", "6", "--workers", "2"]),
    ]);
    expect(a.code).toBe(0);
    expect(b.stdout).toBe(a.stdout);
    const out = JSON.parse(a.stdout);
    expect(Object.keys(out)).toEqual(["trials", "passed", "yield", "wilson95", "clopperPearson95", "ruleFailures", "failingTrials"]);
    expect(out.trials).toBe(3000);
    expect(c.stdout).not.toBe(a.stdout);
  });

  it("synth, match and snap --json (snap through the bin entry)", async () => {
    const [synth, match, snap] = await Promise.all([
      cli(["synth", "--family", "butterworth", "--type", "lowpass", "--order", "5", "--cutoff", "2G", "--json"]),
      cli(["match", "--source-r", "50", "--load-r", "200", "--freq", "100M", "--json"]),
      cli(["snap", "4.83k", "--series", "E24", "--json"], { bin: true }),
    ]);
    expect(synth.code).toBe(0);
    const ladder = JSON.parse(synth.stdout);
    expect(ladder.parts.length).toBe(5);
    // Pozar Example 8.3 (docs/references.md §3 [S values, example no. M]): C1 = 0.984 pF for 5th-order maximally flat, 2 GHz, 50 ohm, shunt first
    expect(ladder.parts[0].value * 1e12).toBeCloseTo(0.984, 3);
    // [C] Butterworth g1 = 2·sin(π/(2n)) (closed form), C1 = g1/(2π·f·R0)
    expect(ladder.parts[0].value).toBeCloseTo((2 * Math.sin(Math.PI / 10)) / (2 * Math.PI * 2e9 * 50), 20);
    expect(match.code).toBe(0);
    expect(JSON.parse(match.stdout).ports[0].z0).toBe(50);
    expect(snap.code).toBe(0);
    // IEC 60063 E24 (docs/references.md §5): 4.7 is the nearest of 4.3/4.7/5.1 to 4.83 → 4.7k, error (4700 − 4830)/4830
    const s = JSON.parse(snap.stdout);
    expect(s.value).toBeCloseTo(4700, 9);
    expect(s.error).toBeCloseTo((4700 - 4830) / 4830, 12);
  });

  it("reads one input from stdin and prints human-readable text without --json", async () => {
    const r = await cli(["run", "-", "--limits", lim, "--trials", "500", "--seed", "x", "--workers", "1"], { stdin: JSON.stringify(JSON.parse(require_("net"))) });
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/^yield .* \(\d+ of 500 trials, seed x\)/);
  });

  it("a spawned process exits 1 on an engine error and 2 on a usage error", async () => {
    const badLimits = file("spawn-bad-lim.json", { rules: [{ metric: "s21_db", from: 1e6, to: 2e6 }] });
    const [engine, usage] = await Promise.all([
      cli(["run", net, "--limits", badLimits, "--trials", "10", "--seed", "1", "--json"]),
      cli(["sweep", net, "--points", "10"]),
    ]);
    expect(engine.code).toBe(1);
    expect(engine.stderr).toMatch(/^lotwise run: limits rules\[0\]\.min: needs min and\/or max\n$/);
    expect(usage.code).toBe(2);
    expect(usage.stderr).toMatch(/^lotwise sweep: sweep needs --from, --to and --points \(see lotwise sweep --help\)\n$/);
  });

  it("the bundled CLI (bin/lotwise.js on dist/cli) prints byte for byte what the TypeScript source prints", async () => {
    // The whole run result (--full) on 2 worker threads, so the bundled trial worker is used and compared too.
    const run = ["run", net, "--limits", lim, "--trials", "2000", "--seed", "11", "--workers", "2", "--chunk-size", "300", "--json", "--full"];
    const sweep = ["sweep", net, "--from", "1M", "--to", "1G", "--points", "21", "--json"];
    const bundledRun = await cli(run, { bin: true }); // builds dist/cli first when it is missing or stale
    expect(bundledRun.stderr).toBe("");
    expect(bundledRun.code).toBe(0);
    expect(existsSync(join(root, "dist/cli/server/cli/main.js"))).toBe(true);
    expect(existsSync(join(root, "dist/cli/workers/trials.worker.js"))).toBe(true);
    const [sourceRun, bundledSweep, sourceSweep] = await Promise.all([cli(run), cli(sweep, { bin: true }), cli(sweep)]);
    expect(JSON.parse(bundledRun.stdout).trials).toBe(2000);
    expect(bundledRun.stdout).toBe(sourceRun.stdout);
    expect(bundledSweep.code).toBe(0);
    expect(bundledSweep.stdout).toBe(sourceSweep.stdout);
  });

});

/** Runs the CLI in this process (same code path as the spawned binary), capturing its output. */
async function cliInProcess(args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  const out: string[] = [];
  const err: string[] = [];
  const so = vi.spyOn(process.stdout, "write").mockImplementation((c: string | Uint8Array) => (out.push(String(c)), true));
  const se = vi.spyOn(process.stderr, "write").mockImplementation((c: string | Uint8Array) => (err.push(String(c)), true));
  try {
    const code = await main(args);
    return { code, stdout: out.join(""), stderr: err.join("") };
  } finally {
    so.mockRestore();
    se.mockRestore();
  }
}

describe("lotwise CLI bad input (in-process main, one line on stderr, no stack trace)", () => {
  it("usage errors exit 2 with one line on stderr", async () => {
    const [unknown, missing, badOpt, badNum] = await seq([
      () => cliInProcess(["frobnicate"]),
      () => cliInProcess(["run", net, "--limits", lim, "--seed", "1"]),
      () => cliInProcess(["sweep", net, "--from", "1M", "--to", "1G", "--points", "10", "--bogus"]),
      () => cliInProcess(["synth", "--family", "butterworth", "--type", "lowpass", "--order", "3", "--cutoff", "fast"]),
    ]);
    for (const r of [unknown, missing, badOpt, badNum]) {
      expect(r.code).toBe(2);
      expect(r.stderr.trim().split("\n").length).toBe(1);
      expect(r.stderr).not.toMatch(/\n\s+at /);
    }
    expect(missing.stderr).toMatch(/run needs --trials N/);
    const h = await cliInProcess(["run", "--help"]);
    expect(h.code).toBe(0);
    expect(h.stdout).toMatch(/Usage: lotwise run NETLIST/);
    expect(badNum.stderr).toMatch(/--cutoff: cannot read "fast"/);
  });

  it("bad input data and engine errors exit 1 with the coded message", async () => {
    const badLimits = file("bad-lim.json", { rules: [{ metric: "s21_db", from: 80e6, to: 1e6, min: -1 }] });
    const portLimits = file("port-lim.json", { rules: [{ metric: "s31_db", from: 1e6, to: 2e6, max: -1 }] });
    const dupNet = file("dup.json", { ports: [{ name: "in", node: "n1", z0: 50 }, { name: "out", node: "n2", z0: 50 }], parts: [
      { ref: "L1", kind: "L", nodes: ["n1", "n2"], value: 1e-7 }, { ref: "L1", kind: "L", nodes: ["n1", "n2"], value: 1e-7 }] });
    const [a, b, c, d, e] = await seq([
      () => cliInProcess(["run", net, "--limits", badLimits, "--trials", "10", "--seed", "1", "--json"]),
      () => cliInProcess(["run", net, "--limits", portLimits, "--trials", "10", "--seed", "1"]),
      () => cliInProcess(["sweep", dupNet, "--from", "1M", "--to", "1G", "--points", "10"]),
      () => cliInProcess(["sweep", join(dir, "missing.json"), "--from", "1M", "--to", "1G", "--points", "10"]),
      () => cliInProcess(["snap", "0", "--series", "E24"]),
    ]);
    for (const r of [a, b, c, d, e]) {
      expect(r.code).toBe(1);
      expect(r.stdout).toBe("");
      expect(r.stderr.trim().split("\n").length).toBe(1);
    }
    expect(a.stderr).toMatch(/limits rules\[0\]\.to: band must have from < to/);
    expect(b.stderr).toMatch(/INVALID_LIMITS at rules\[0\]\.metric: .*names port 3/);
    expect(c.stderr).toMatch(/INVALID_NETLIST/);
    expect(c.stderr).toMatch(/L1/);
    expect(d.stderr).toMatch(/cannot read netlist file .*ENOENT/);
    expect(e.stderr).toMatch(/INVALID_INPUT/);
  });
});

function require_(name: "net"): string {
  return JSON.stringify({
    ports: [{ name: "in", node: "n1", z0: 50 }, { name: "out", node: "n2", z0: 50 }],
    parts: [{ ref: "C1", kind: "C", nodes: ["n1", "gnd"], value: 31.831e-12, tolerance: 0.05 }, { ref: "L2", kind: "L", nodes: ["n1", "n2"], value: 159.155e-9, tolerance: 0.05 }, { ref: "C3", kind: "C", nodes: ["n2", "gnd"], value: 31.831e-12, tolerance: 0.05 }],
    name,
  });
}

async function seq<T>(fns: (() => Promise<T>)[]): Promise<T[]> {
  const out: T[] = [];
  for (const f of fns) out.push(await f());
  return out;
}
