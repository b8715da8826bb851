import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DesignRevision, MeasuredResponse } from "../../server/entities";
import { createTestContext, ORIGIN, type TestContext } from "../helpers/test-context";
import { makeSampleDesign, SAMPLE_CSV, SAMPLE_S2P, sampleNetlist } from "./access-samples/designs";

let t: TestContext;
let designer: Awaited<ReturnType<TestContext["signedInAgent"]>>;
let analyst: Awaited<ReturnType<TestContext["signedInAgent"]>>;
beforeAll(async () => {
  t = await createTestContext();
  designer = await t.signedInAgent(["designer"]);
  analyst = await t.signedInAgent(["analyst"]);
});
afterAll(() => t?.close());

const counts = async () => ({
  revisions: await t.ctx.dataSource.getRepository(DesignRevision).count(),
  measured: await t.ctx.dataSource.getRepository(MeasuredResponse).count(),
});

function upload(designId: string, content: string | Buffer, filename: string, fields: Record<string, string> = {}) {
  let req = designer.agent.post(`/api/designs/${designId}/revisions/upload`).set("Origin", ORIGIN);
  for (const [k, v] of Object.entries(fields)) req = req.field(k, v);
  return req.attach("file", Buffer.isBuffer(content) ? content : Buffer.from(content), filename);
}

/** Expects 400 INVALID_FILE with this message (also in fields.file) and nothing stored. */
async function expectRejected(send: () => Promise<{ status: number; body: { error: { code: string; message: string; fields?: Record<string, string> } } }>, message: string | RegExp) {
  const before = await counts();
  const res = await send();
  expect(res.status).toBe(400);
  expect(res.body.error.code).toBe("INVALID_FILE");
  if (typeof message === "string") expect(res.body.error.message).toBe(message);
  else expect(res.body.error.message).toMatch(message);
  expect(res.body.error.fields).toEqual({ file: res.body.error.message });
  expect(await counts()).toEqual(before);
}

describe("revision uploads", () => {
  it("makes a revision from a parts table, with the ports of the newest revision", async () => {
    const { design, revision } = await makeSampleDesign(t, designer.user);
    const res = await upload(design.id, SAMPLE_CSV, "bench-parts.csv", { note: "from the bench" }).expect(201);
    expect(res.body.revision).toMatchObject({ number: 2, parentId: revision.id, note: "from the bench", sweep: revision.sweep });
    expect(res.body.revision.netlist.ports).toEqual(sampleNetlist().ports);
    // SAMPLE_CSV: 33p with letter J (IEC 60062: ±5 %), 150n
    expect(res.body.revision.netlist.parts.map((p: { ref: string; value: number; tolerance: number }) => [p.ref, p.value, p.tolerance])).toEqual([
      ["C1", 33e-12, 0.05], ["L2", 150e-9, 0.05], ["C3", 33e-12, 0.05],
    ]);
  });

  it("makes a revision from a netlist JSON; the note defaults to the file name", async () => {
    const { design } = await makeSampleDesign(t, designer.user);
    const netlist = sampleNetlist();
    const res = await upload(design.id, JSON.stringify(netlist, null, 2), "netlist.json").expect(201);
    expect(res.body.revision.netlist).toEqual(netlist);
    expect(res.body.revision.note).toBe("uploaded netlist.json");
  });

  it("names the line and the column of a bad parts table", async () => {
    const { design } = await makeSampleDesign(t, designer.user);
    const csv = "ref,kind,node1,node2,value\nC1,C,n1,gnd,33p\nL2,L,n1,n2,4.7x\nC3,C,n2,gnd,33p\n";
    await expectRejected(() => upload(design.id, csv, "parts.csv"), /^line 3: value: /);
    const dangling = "ref,kind,node1,node2,value\n# a comment line\nC1,C,n1,gnd,33p\nL2,L,n1,n2,150n\nC3,C,n2,gnd,33p\nC4,C,x,y,1p\n";
    await expectRejected(() => upload(design.id, dangling, "parts.csv"), /^line 6: nodes: part C4: node "x" is dangling/);
  });

  it("names the line and the field of a bad netlist JSON (syntax, shape and meaning)", async () => {
    const { design } = await makeSampleDesign(t, designer.user);
    const pretty = (n: unknown) => JSON.stringify(n, null, 2);
    await expectRejected(() => upload(design.id, '{\n  "ports": [],\n  "parts": [,]\n}\n', "n.json"), "line 3: json: unexpected \",\" (column 13)");
    const negative = sampleNetlist();
    negative.parts[1].value = -1;
    const text = pretty(negative);
    const line = text.split("\n").findIndex((l) => l.includes('"value": -1')) + 1;
    await expectRejected(() => upload(design.id, text, "n.json"), `line ${line}: parts[1].value: value must be > 0`);
    const dup = sampleNetlist();
    dup.parts[2].ref = "C1";
    const dupText = pretty(dup);
    const dupLine = dupText.split("\n").findIndex((l, k, all) => l.includes('"ref": "C1"') && all.slice(0, k).some((p) => p.includes('"ref": "C1"'))) + 1;
    await expectRejected(() => upload(design.id, dupText, "n.json"), new RegExp(`^line ${dupLine}: parts\\[2\\]\\.ref: part C1: duplicate ref`));
  });

  it("checks the content, not only the name", async () => {
    const { design } = await makeSampleDesign(t, designer.user);
    await expectRejected(() => upload(design.id, JSON.stringify(sampleNetlist()), "parts.csv"), "line 1: file: the file is named .csv but holds a JSON document");
    await expectRejected(() => upload(design.id, SAMPLE_CSV, "netlist.json"), "line 1: file: the file is named .json but holds CSV text");
    await expectRejected(() => upload(design.id, SAMPLE_S2P, "parts.csv"), "line 1: file: the file is named .csv but holds a Touchstone file");
    await expectRejected(() => upload(design.id, Buffer.from([0x72, 0x65, 0x66, 0x0a, 0x00, 0x01]), "parts.csv"), "line 2: file: this is a binary file, not text");
    await expectRejected(() => upload(design.id, Buffer.from([0x72, 0x65, 0xff, 0xfe]), "parts.csv"), "line 1: file: not UTF-8 text (save the file as UTF-8)");
    await expectRejected(() => upload(design.id, SAMPLE_CSV, "parts.txt"), 'file: "parts.txt" is neither a .csv parts table nor a .json netlist');
    await expectRejected(() => designer.agent.post(`/api/designs/${design.id}/revisions/upload`).set("Origin", ORIGIN).field("note", "no file"), 'no file: send it as multipart/form-data in the field "file"');
  });

  it("answers 413 naming the limit for a file over 1 MiB, storing nothing", async () => {
    const { design } = await makeSampleDesign(t, designer.user);
    const before = await counts();
    const big = SAMPLE_CSV + `# ${"x".repeat(1024 * 1024)}\n`;
    const res = await upload(design.id, big, "parts.csv");
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe("PAYLOAD_TOO_LARGE");
    expect(res.body.error.message).toBe("The file is larger than the limit of 1 MiB (1048576 bytes).");
    expect(await counts()).toEqual(before);
  });
});

describe("measured responses", () => {
  it("stores a two-port Touchstone file and gives |S| dB back per pair", async () => {
    const { design } = await makeSampleDesign(t, designer.user);
    const res = await analyst.agent.post(`/api/designs/${design.id}/measured`).set("Origin", ORIGIN).field("name", "unit 7").attach("file", Buffer.from(SAMPLE_S2P), "unit-7.s2p").expect(201);
    expect(res.body.measured).toMatchObject({ name: "unit 7", fileName: "unit-7.s2p", points: 3 });
    const page = await designer.agent.get(`/api/designs/${design.id}`).expect(200);
    expect(page.body.measured).toEqual([expect.objectContaining({ id: res.body.measured.id, name: "unit 7", points: 3 })]);
    const read = await designer.agent.get(`/api/measured/${res.body.measured.id}`).expect(200);
    const { data } = read.body.measured;
    expect(data.freqs).toEqual([10e6, 100e6, 1000e6]); // SAMPLE_S2P: "# MHz", 10, 100, 1000
    expect(data.ports).toBe(2);
    expect(data.z0).toEqual([50, 50]);
    // the dB values written in SAMPLE_S2P (v1 order N11 N21 N12 N22), 9 significant digits stored
    expect(data.sDb.s11.map((x: number) => Number(x.toFixed(6)))).toEqual([-30, -25, -3]);
    expect(data.sDb.s21.map((x: number) => Number(x.toFixed(6)))).toEqual([-0.1, -0.5, -20]);
    expect(data.sDb.s22.map((x: number) => Number(x.toFixed(6)))).toEqual([-30, -25, -3]);
  });

  it("takes a one-port file (s11 only) and names the file as the default name", async () => {
    const { design } = await makeSampleDesign(t, designer.user);
    const res = await designer.agent.post(`/api/designs/${design.id}/measured`).set("Origin", ORIGIN).attach("file", Buffer.from("# Hz S RI R 50\n1e6 0.5 0\n2e6 0.1 0\n"), "antenna.s1p").expect(201);
    expect(res.body.measured).toMatchObject({ name: "antenna", points: 2 });
    const read = await designer.agent.get(`/api/measured/${res.body.measured.id}`).expect(200);
    // 20·log10(0.5) = −6.0206 dB, 20·log10(0.1) = −20 dB
    expect(read.body.measured.data.sDb.s11[0]).toBeCloseTo(20 * Math.log10(0.5), 9);
    expect(read.body.measured.data.sDb.s11[1]).toBeCloseTo(-20, 9);
    expect(Object.keys(read.body.measured.data.sDb)).toEqual(["s11"]);
  });

  it("refuses bad Touchstone files with the line and the field, storing nothing", async () => {
    const { design } = await makeSampleDesign(t, designer.user);
    const send = (content: string, name: string) => () => designer.agent.post(`/api/designs/${design.id}/measured`).set("Origin", ORIGIN).attach("file", Buffer.from(content), name);
    await expectRejected(send("# MHz S DB R 50\n10 -30 0 -0.1 -10 -0.1 -10 -30 0\n100 -25 0 -0.5 x -0.5 -90 -25 0\n", "bad.s2p"), /^line 3: /);
    await expectRejected(send(SAMPLE_CSV, "parts.s2p"), "line 1: file: the file is named .s2p but holds CSV text");
    await expectRejected(send(SAMPLE_S2P, "bench.csv"), 'file: "bench.csv" is not a .s1p or .s2p Touchstone file');
  });

  it("answers 413 over 5 MiB and deletes a measured response", async () => {
    const { design } = await makeSampleDesign(t, designer.user);
    const before = await counts();
    const big = `${SAMPLE_S2P}${"! padding\n".repeat(550_000)}`;
    const res = await designer.agent.post(`/api/designs/${design.id}/measured`).set("Origin", ORIGIN).attach("file", Buffer.from(big), "big.s2p");
    expect(res.status).toBe(413);
    expect(res.body.error.message).toBe("The file is larger than the limit of 5 MiB (5242880 bytes).");
    expect(await counts()).toEqual(before);
    const made = await designer.agent.post(`/api/designs/${design.id}/measured`).set("Origin", ORIGIN).attach("file", Buffer.from(SAMPLE_S2P), "x.s2p").expect(201);
    await designer.agent.delete(`/api/measured/${made.body.measured.id}`).set("Origin", ORIGIN).expect(204);
    await designer.agent.delete(`/api/measured/${made.body.measured.id}`).set("Origin", ORIGIN).expect(404);
    await designer.agent.get(`/api/measured/${made.body.measured.id}`).expect(404);
  });
});
