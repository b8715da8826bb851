import http from "node:http";
import type { AddressInfo } from "node:net";
import { brotliCompressSync, deflateSync, gzipSync } from "node:zlib";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestContext, ORIGIN, type TestContext } from "../helpers/test-context";
import { sampleLimits, sampleNetlist } from "./access-samples/designs";

// Issue 10 ("Trust"), item 7: request bodies anyone can send must never answer 500. A Content-Encoding that the
// body does not match is a coded 400; a lone UTF-16 surrogate (which MariaDB's JSON columns refuse) is a 400 naming
// the field, on every route, JSON body or uploaded JSON file alike.

let t: TestContext;
let server: http.Server;
let base: string;
let cookie: string;
let designId: string;

beforeAll(async () => {
  t = await createTestContext();
  server = await new Promise<http.Server>((resolve) => {
    const s = t.app.listen(0, "127.0.0.1", () => resolve(s));
  });
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const designer = await t.buildUser({ roles: ["designer", "planner"] });
  cookie = (await t.ctx.sessions.create(designer.id)).split(";")[0];
  const created = await request(t.app).post("/api/designs").set("Origin", ORIGIN).set("Cookie", cookie).send({ name: "Trust low-pass", netlist: sampleNetlist() }).expect(201);
  designId = created.body.design.id;
});
afterAll(async () => {
  server?.closeAllConnections();
  await new Promise((resolve) => server?.close(resolve));
  await t?.close();
});

/** A POST with exactly these bytes and headers (supertest would serialize a Buffer as JSON). */
function rawPost(path: string, body: Buffer, headers: Record<string, string>): Promise<{ status: number; body: { error?: { code: string; message: string; fields?: Record<string, string> } } }> {
  return new Promise((resolve, reject) => {
    const req = http.request(`${base}${path}`, { method: "POST", headers: { origin: ORIGIN, cookie, "content-type": "application/json", "content-length": String(body.length), ...headers } }, (res) => {
      const chunks: Buffer[] = [];
      res.on("data", (c: Buffer) => chunks.push(c));
      res.on("end", () => {
        const text = Buffer.concat(chunks).toString("utf8");
        try {
          resolve({ status: res.statusCode ?? 0, body: JSON.parse(text) });
        } catch {
          reject(new Error(`not JSON (${res.statusCode}): ${text.slice(0, 200)}`));
        }
      });
    });
    req.on("error", reject);
    req.end(body);
  });
}

const compress = { gzip: gzipSync, deflate: deflateSync, br: brotliCompressSync } as const;

describe("Content-Encoding that the body does not match", () => {
  const routes = () => [
    { path: "/api/auth/sign-in", body: { email: "someone@lotwise.test", password: "whatever it is" } },
    { path: "/api/designs", body: { name: "Compressed", netlist: sampleNetlist() } },
    { path: `/api/designs/${designId}/limit-sets`, body: { name: "Mask", limits: sampleLimits(), lotSize: 500 } },
  ];

  it("answers 400 INVALID_JSON for an uncompressed, truncated or garbled body, on every route", async () => {
    const outcomes: unknown[] = [];
    const want: unknown[] = [];
    for (const route of routes()) {
      const json = Buffer.from(JSON.stringify(route.body));
      for (const encoding of ["gzip", "deflate", "br"] as const) {
        const packed = compress[encoding](json);
        const bodies = { plain: json, truncated: packed.subarray(0, Math.floor(packed.length / 2)), garbled: Buffer.concat([packed.subarray(0, 4), Buffer.from("not compressed at all")]) };
        for (const [kind, body] of Object.entries(bodies)) {
          const res = await rawPost(route.path, body, { "content-encoding": encoding });
          outcomes.push({ path: route.path, encoding, kind, status: res.status, code: res.body.error?.code });
          want.push({ path: route.path, encoding, kind, status: 400, code: "INVALID_JSON" });
        }
      }
    }
    expect(outcomes).toEqual(want);
  });

  it("still reads a body that is compressed as it says", async () => {
    const body = Buffer.from(JSON.stringify({ name: "Gzipped design", netlist: sampleNetlist() }));
    for (const encoding of ["gzip", "deflate", "br"] as const) {
      const res = await rawPost("/api/designs", compress[encoding](body), { "content-encoding": encoding });
      expect(res.status).toBe(201);
    }
  });

  it("names the problem in the message", async () => {
    const res = await rawPost("/api/auth/sign-in", Buffer.from('{"email":"a@lotwise.test","password":"x"}'), { "content-encoding": "gzip" });
    expect(res.body.error!.message).toMatch(/decompress/i);
  });
});

describe("lone UTF-16 surrogates", () => {
  const LONE = '"x\\ud800y"'; // JSON text for a string holding an unpaired high surrogate
  const sendJson = (path: string, json: string, method: "post" | "put" = "post") =>
    request(t.app)[method](path).set("Origin", ORIGIN).set("Cookie", cookie).set("Content-Type", "application/json").send(json);

  it("refuses them with 400 VALIDATION_FAILED naming the field path, on several routes", async () => {
    const netlist = JSON.stringify(sampleNetlist());
    const withLone = (change: (n: ReturnType<typeof sampleNetlist>) => void) => {
      const n = sampleNetlist();
      change(n);
      return JSON.stringify(n).replace('"PLACEHOLDER"', LONE);
    };
    const cases: { path: string; json: string; field: string; method?: "put" }[] = [
      { path: "/api/designs", json: `{"name":"Fine","netlist":${withLone((n) => (n.name = "PLACEHOLDER"))}}`, field: "netlist.name" },
      { path: "/api/designs", json: `{"name":${LONE},"netlist":${netlist}}`, field: "name" },
      { path: `/api/designs/${designId}/revisions`, json: `{"note":"next","netlist":${withLone((n) => (n.ports[0].name = "PLACEHOLDER"))}}`, field: "netlist.ports[0].name" },
      {
        path: `/api/designs/${designId}/limit-sets`,
        json: `{"name":"Mask","lotSize":500,"limits":{"rules":[{"metric":"s21_db","from":1e6,"to":6e7,"min":-1,"label":${LONE}}]}}`,
        field: "limits.rules[0].label",
      },
      { path: `/api/designs/${designId}/limit-sets`, json: `{"name":"Mask","lotSize":500,"limits":{"rules":[{"metric":"s21_db","from":1e6,"to":6e7,"min":-1,"label":"x\\udc00"}]}}`, field: "limits.rules[0].label" },
    ];
    const outcomes: unknown[] = [];
    for (const c of cases) {
      const res = await sendJson(c.path, c.json);
      const message = String(res.body.error?.message);
      outcomes.push({ path: c.path, status: res.status, code: res.body.error?.code, fields: Object.keys(res.body.error?.fields ?? {}), names: message.startsWith(`${c.field}: `) && /surrogate/.test(message) });
    }
    expect(outcomes).toEqual(cases.map((c) => ({ path: c.path, status: 400, code: "VALIDATION_FAILED", fields: [c.field], names: true })));
  });

  it("refuses them in an uploaded JSON netlist with INVALID_FILE naming the line", async () => {
    const text = JSON.stringify({ ...sampleNetlist(), name: "PLACEHOLDER" }, null, 2).replace('"PLACEHOLDER"', LONE);
    const res = await request(t.app).post(`/api/designs/${designId}/revisions/upload`).set("Origin", ORIGIN).set("Cookie", cookie).attach("file", Buffer.from(text), "netlist.json");
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe("INVALID_FILE");
    expect(res.body.error.fields.file).toMatch(/^line 2: name: .*surrogate/);
  });

  it("keeps well-formed text (surrogate pairs, emoji) as it is, and a multipart field never carries a lone one", async () => {
    const res = await request(t.app).post(`/api/designs/${designId}/measured`).set("Origin", ORIGIN).set("Cookie", cookie)
      .field("name", "bench \ud800").attach("file", Buffer.from("# MHz S DB R 50\n10 -30 0 -0.1 -10 -0.1 -10 -30 0\n100 -25 0 -0.5 -90 -0.5 -90 -25 0\n"), "unit.s2p");
    // multipart text is UTF-8 on the wire, so the lone surrogate arrives as U+FFFD: stored, not a 500
    expect(res.status).toBe(201);
    expect(res.body.measured.name).toBe("bench \uFFFD");
    const ok = await sendJson("/api/designs", JSON.stringify({ name: "Low-pass \u{1F4E1} \ud83d\udce1", netlist: { ...sampleNetlist(), name: "Ω \u{1F50C}" } }));
    expect(ok.status).toBe(201);
    expect(ok.body.design.name).toBe("Low-pass \u{1F4E1} \u{1F4E1}");
  });
});
