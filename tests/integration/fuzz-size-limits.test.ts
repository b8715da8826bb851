import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Netlist } from "../../shared/engine/netlist";
import { MAX_POINTS } from "../../shared/engine/frequency-grid";
import { MAX_API_TRIALS } from "../../shared/schemas/run-request";
import { MAX_MEASURED_POINTS } from "../../server/services/revision-files";
import { MEASURED_UPLOAD_LIMIT, REVISION_UPLOAD_LIMIT } from "../../server/services/uploads";
import { diffSnapshots, snapshotDb } from "../helpers/db-snapshot";
import { DbGuard, REQUEST_TIMEOUT } from "../helpers/fuzz-api";
import { createTestContext, ORIGIN, type TestContext } from "../helpers/test-context";
import { SAMPLE_CSV, SAMPLE_S2P, sampleLimits, sampleNetlist } from "./access-samples/designs";

/**
 * Size limits, each at the limit (accepted) and one past it (refused with 413 or 400, the message naming the limit,
 * the database unchanged): parts per netlist (500), points per sweep (10001), trials per run (1e6 through the API),
 * upload bytes (1 MiB revision files, 5 MiB measured responses), points per measured response (20001), JSON body
 * bytes (1 MiB). The numbers are the ones the README promises ("Data formats", "API").
 */

const MiB = 1024 * 1024;

let t: TestContext;
let designer: Awaited<ReturnType<TestContext["signedInAgent"]>>;
let planner: Awaited<ReturnType<TestContext["signedInAgent"]>>;
let guard: DbGuard;
let designId: string;
let revisionId: string;
let limitSetId: string;

beforeAll(async () => {
  t = await createTestContext();
  await t.ctx.runQueue.close(); // a 1e6-trial run must stay queued, not run
  designer = await t.signedInAgent(["designer"]);
  planner = await t.signedInAgent(["planner"]);
  const created = await designer.agent.post("/api/designs").set("Origin", ORIGIN).send({ name: "Limits target", netlist: sampleNetlist() }).expect(201);
  designId = created.body.design.id;
  revisionId = created.body.revision.id;
  limitSetId = (await planner.agent.post(`/api/designs/${designId}/limit-sets`).set("Origin", ORIGIN).send({ name: "Mask", limits: sampleLimits(), lotSize: 100 }).expect(201)).body.limitSet.id;
  guard = new DbGuard(t);
});
afterAll(() => t?.close());

/** An L-C ladder of `n` parts (series L, shunt C, alternating) between two 50 Ω ports: a netlist that compiles at any size. */
function ladder(n: number): Netlist {
  const parts: Netlist["parts"] = [];
  for (let k = 0; k < n; k++) {
    const stage = k >> 1;
    parts.push(k % 2 === 0 ? { ref: `L${k}`, kind: "L", nodes: [`n${stage}`, `n${stage + 1}`], value: 1e-7 } : { ref: `C${k}`, kind: "C", nodes: [`n${stage + 1}`, "gnd"], value: 1e-11 });
  }
  const last = parts[parts.length - 1].nodes.find((x) => x !== "gnd")!;
  return { ports: [{ name: "in", node: "n0", z0: 50 }, { name: "out", node: last, z0: 50 }], parts };
}

const postJson = (agent: typeof designer.agent, path: string, body: unknown) => agent.post(path).set("Origin", ORIGIN).timeout(REQUEST_TIMEOUT).send(body as object);
const upload = (route: string, content: string, name: string) =>
  designer.agent.post(`/api/designs/${designId}/${route}`).set("Origin", ORIGIN).timeout(REQUEST_TIMEOUT).attach("file", Buffer.from(content, "utf8"), name);

/** Pads text with comment lines (`#` for CSV, `!` for Touchstone) to exactly `bytes` UTF-8 bytes. */
function padTo(text: string, bytes: number, comment: string): string {
  const line = `${comment}${"x".repeat(998)}\n`; // 1000 bytes
  const room = bytes - Buffer.byteLength(text);
  const full = Math.floor(room / line.length);
  const rest = room - full * line.length;
  const out = text + line.repeat(full) + (rest === 0 ? "" : rest === 1 ? "\n" : `${comment}${"x".repeat(rest - 2)}\n`);
  expect(Buffer.byteLength(out)).toBe(bytes);
  return out;
}

/** Expects a refusal with this status, code and message, and the database as it was. */
async function expectRefused(what: string, send: () => PromiseLike<import("supertest").Response>, status: number, code: string, message: string | RegExp) {
  const res = await guard.send(what, send);
  expect(res.status, what).toBe(status);
  expect(res.body.error.code, what).toBe(code);
  if (typeof message === "string") expect(res.body.error.message, what).toBe(message);
  else expect(res.body.error.message, what).toMatch(message);
}

describe("the database fingerprint", () => {
  it("changes when a request is accepted (so an unchanged fingerprint means something)", async () => {
    const before = await snapshotDb(t.ctx.dataSource);
    await postJson(designer.agent, "/api/designs", { name: "Fingerprint check", netlist: sampleNetlist() }).expect(201);
    const diff = diffSnapshots(before, await snapshotDb(t.ctx.dataSource));
    expect(diff.some((d) => d.startsWith("design:"))).toBe(true);
    expect(diff.some((d) => d.startsWith("design_revision:"))).toBe(true);
  });

  it("changes when only a value changes, not the row count", async () => {
    const before = await snapshotDb(t.ctx.dataSource);
    await designer.agent.patch(`/api/designs/${designId}`).set("Origin", ORIGIN).send({ description: "edited once" }).expect(200);
    const diff = diffSnapshots(before, await snapshotDb(t.ctx.dataSource));
    expect(diff.find((d) => d.startsWith("design:"))).toMatch(/rows (\d+) → \1, checksum/);
  });
});

describe("size limits: at the limit accepted, one past refused naming the limit", () => {
  it("parts per netlist: 500 accepted, 501 refused (400, 'at most 500 parts')", async () => {
    const at = await guard.send("500 parts", () => postJson(designer.agent, "/api/designs", { name: "500 parts", netlist: ladder(500) }));
    expect(at.status).toBe(201);
    expect(at.body.revision.netlist.parts).toHaveLength(500);
    await expectRefused("501 parts", () => postJson(designer.agent, "/api/designs", { name: "501 parts", netlist: ladder(501) }), 400, "VALIDATION_FAILED", "netlist.parts: at most 500 parts");
    await expectRefused("501 parts revision", () => postJson(designer.agent, `/api/designs/${designId}/revisions`, { netlist: ladder(501) }), 400, "VALIDATION_FAILED", "netlist.parts: at most 500 parts");
  });

  it("parts per uploaded table: 500 rows accepted, 501 refused naming the line and the limit", async () => {
    const table = (n: number) => "ref,kind,node1,node2,value\n" + ladder(n).parts.map((p) => `${p.ref},${p.kind},${p.nodes[0]},${p.nodes[1]},${p.value}`).join("\n") + "\n";
    // a CSV takes its ports from the latest revision: make that a 500-part ladder with the same port nodes
    const base = await postJson(designer.agent, "/api/designs", { name: "CSV 500", netlist: ladder(500) }).expect(201);
    const path = `/api/designs/${base.body.design.id}/revisions/upload`;
    const send = (n: number) => () => designer.agent.post(path).set("Origin", ORIGIN).timeout(REQUEST_TIMEOUT).attach("file", Buffer.from(table(n)), "parts.csv");
    await guard.reset();
    expect((await guard.send("500 rows", send(500))).status).toBe(201);
    await expectRefused("501 rows", send(501), 400, "INVALID_FILE", "line 502: ref: too many parts: at most 500 parts are supported");
  });

  it(`points per sweep: ${MAX_POINTS} accepted, ${MAX_POINTS + 1} refused (400, '≤ ${MAX_POINTS}')`, async () => {
    const sweep = (points: number) => ({ from: 1e6, to: 1e9, points, scale: "log" });
    expect((await guard.send("10001 points", () => postJson(designer.agent, "/api/designs", { name: "Fine sweep", netlist: sampleNetlist(), sweep: sweep(MAX_POINTS) }))).status).toBe(201);
    await expectRefused("10002 points", () => postJson(designer.agent, "/api/designs", { name: "Too fine", netlist: sampleNetlist(), sweep: sweep(MAX_POINTS + 1) }), 400, "VALIDATION_FAILED", "sweep.points: points must be ≤ 10001");
    await expectRefused("10002 points revision", () => designer.agent.put(`/api/revisions/${revisionId}`).set("Origin", ORIGIN).timeout(REQUEST_TIMEOUT).send({ netlist: sampleNetlist(), sweep: sweep(MAX_POINTS + 1) }), 400, "VALIDATION_FAILED", "sweep.points: points must be ≤ 10001");
  });

  it(`trials per run: ${MAX_API_TRIALS} accepted (queued), ${MAX_API_TRIALS + 1} refused (400, '≤ 1000000')`, async () => {
    const body = (trials: number) => ({ revisionId, limitSetId, trials, seed: 1 });
    await expectRefused("1e6+1 trials", () => postJson(planner.agent, "/api/runs", body(MAX_API_TRIALS + 1)), 400, "VALIDATION_FAILED", "trials: trials must be ≤ 1000000");
    const at = await guard.send("1e6 trials", () => postJson(planner.agent, "/api/runs", body(MAX_API_TRIALS)));
    expect(at.status).toBe(201);
    expect(at.body.run).toMatchObject({ state: "queued", trialsTotal: 1_000_000 });
  });

  it("revision upload bytes: exactly 1 MiB accepted, 1 MiB + 1 refused (413 naming 1 MiB)", async () => {
    expect(REVISION_UPLOAD_LIMIT).toBe(MiB); // README: "parts CSV or netlist JSON, ≤ 1 MiB"
    expect((await guard.send("1 MiB csv", () => upload("revisions/upload", padTo(SAMPLE_CSV, MiB, "#"), "parts.csv"))).status).toBe(201);
    expect((await guard.send("1 MiB json", () => upload("revisions/upload", JSON.stringify(sampleNetlist()).padEnd(MiB, " "), "netlist.json"))).status).toBe(201);
    await expectRefused("1 MiB + 1 csv", () => upload("revisions/upload", padTo(SAMPLE_CSV, MiB + 1, "#"), "parts.csv"), 413, "PAYLOAD_TOO_LARGE", "The file is larger than the limit of 1 MiB (1048576 bytes).");
  });

  it("measured upload bytes: exactly 5 MiB accepted, 5 MiB + 1 refused (413 naming 5 MiB)", async () => {
    expect(MEASURED_UPLOAD_LIMIT).toBe(5 * MiB); // README: "Touchstone .s1p/.s2p …, ≤ 5 MiB"
    expect((await guard.send("5 MiB s2p", () => upload("measured", padTo(SAMPLE_S2P, 5 * MiB, "!"), "bench.s2p"))).status).toBe(201);
    await expectRefused("5 MiB + 1 s2p", () => upload("measured", padTo(SAMPLE_S2P, 5 * MiB + 1, "!"), "bench.s2p"), 413, "PAYLOAD_TOO_LARGE", "The file is larger than the limit of 5 MiB (5242880 bytes).");
  });

  it(`points per measured response: ${MAX_MEASURED_POINTS} accepted, ${MAX_MEASURED_POINTS + 1} refused naming the limit`, async () => {
    const s1p = (n: number) => "# Hz S RI R 50\n" + Array.from({ length: n }, (_, k) => `${k + 1} 0.5 0`).join("\n") + "\n";
    const at = await guard.send("20001 points", () => upload("measured", s1p(MAX_MEASURED_POINTS), "sweep.s1p"));
    expect(at.status).toBe(201);
    expect(at.body.measured.points).toBe(20_001);
    await expectRefused("20002 points", () => upload("measured", s1p(MAX_MEASURED_POINTS + 1), "sweep.s1p"), 400, "INVALID_FILE", "frequency: 20002 frequencies: at most 20001 are kept per measured response");
  });

  it("JSON request body bytes: exactly 1 MiB accepted, 1 MiB + 1 refused (413 naming 1048576 bytes)", async () => {
    const text = (bytes: number) => JSON.stringify({ name: "Padded body", netlist: sampleNetlist() }).padEnd(bytes, " ");
    const send = (bytes: number) => () => designer.agent.post("/api/designs").set("Origin", ORIGIN).set("Content-Type", "application/json").timeout(REQUEST_TIMEOUT).send(text(bytes));
    expect((await guard.send("1 MiB body", send(MiB))).status).toBe(201);
    await expectRefused("1 MiB + 1 body", send(MiB + 1), 413, "PAYLOAD_TOO_LARGE", "The request body is larger than the limit of 1048576 bytes.");
  });
});
