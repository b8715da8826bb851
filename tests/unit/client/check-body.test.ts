import { describe, expect, it } from "vitest";
import { CONTRACTS } from "@shared/contracts";
import { ApiError, checkBody } from "@/lib/api-client";
import { AppError } from "../../../server/errors";
import { parseInput } from "../../../server/routes/api-router";

// The client checks a request body with the endpoint's contract schema before sending it (src/lib/api-client.ts,
// checkBody). A refusal there must read exactly like the server's 400 for the same body, fields named the same way,
// so a form shows either one the same.

function clientRefusal(schema: Parameters<typeof checkBody>[0], body: unknown) {
  try {
    checkBody(schema, body);
    return null;
  } catch (err) {
    expect(err).toBeInstanceOf(ApiError);
    const e = err as ApiError;
    return { status: e.status, code: e.code, message: e.message, fields: e.fields };
  }
}

function serverRefusal(schema: Parameters<typeof checkBody>[0], body: unknown) {
  try {
    parseInput(schema, body, "body");
    return null;
  } catch (err) {
    expect(err).toBeInstanceOf(AppError);
    const e = err as AppError;
    return { status: 400, code: e.code, message: e.message, fields: e.fields };
  }
}

const netlist = {
  ports: [{ name: "in", node: "n1", z0: 50 }, { name: "out", node: "n2", z0: 50 }],
  parts: [{ ref: "C1", kind: "C", nodes: ["n1", "gnd"], value: 1e-11, tolerance: 0.05 }],
};

const cases: [string, keyof typeof CONTRACTS, unknown][] = [
  ["a good revision", "post /designs/:id/revisions", { netlist }],
  ["a part value of zero", "post /designs/:id/revisions", { netlist: { ...netlist, parts: [{ ...netlist.parts[0], value: 0 }] } }],
  ["a misspelt part field", "put /revisions/:id", { netlist: { ...netlist, parts: [{ ...netlist.parts[0], tolerence: 0.05 }] } }],
  ["a field the server owns", "post /runs", { revisionId: "0b6f3a4e-7d4c-4a39-9d7e-2f5b8f1c9a10", limitSetId: "0b6f3a4e-7d4c-4a39-9d7e-2f5b8f1c9a11", trials: 10, sweepId: "x" }],
  ["too many trials", "post /runs", { revisionId: "0b6f3a4e-7d4c-4a39-9d7e-2f5b8f1c9a10", limitSetId: "0b6f3a4e-7d4c-4a39-9d7e-2f5b8f1c9a11", trials: 2e6 }],
  ["an empty comment", "post /runs/:id/comments", { body: "   " }],
  ["an unknown review action", "post /revisions/:id/review", { action: "merge" }],
  ["a grade without tolerance", "post /grades", { kind: "C", code: "J", label: "±5 %", costEach: 0.01 }],
];

describe("checkBody", () => {
  for (const [what, endpoint, body] of cases) {
    it(`refuses ${what} as the server does (${endpoint})`, () => {
      const schema = (CONTRACTS[endpoint] as { body: Parameters<typeof checkBody>[0] }).body;
      const refusal = clientRefusal(schema, body);
      expect(refusal === null).toBe(what === "a good revision");
      expect(refusal).toEqual(serverRefusal(schema, body));
    });
  }

  it("sends the body as given when it passes (the server applies the schema's trimming)", () => {
    const body = { body: "  looks fine  " };
    expect(checkBody(CONTRACTS["post /runs/:id/comments"].body, body)).toBe(body);
  });
});
