import { describe, expect, it } from "vitest";
import { EngineError } from "../../../shared/engine/errors";
import type { Netlist, Part } from "../../../shared/engine/netlist";
import { compileNetlist, createSweepEvaluator, nominalValues } from "../../../shared/engine/solver";
import { netlistSchema } from "../../../shared/schemas/netlist";

/** A valid 3rd-order low-pass (C-L-C) between two 50 ohm ports; tests break one thing at a time. */
function base(): Netlist {
  return {
    ports: [
      { name: "in", node: "n1", z0: 50 },
      { name: "out", node: "n2", z0: 50 },
    ],
    parts: [
      { ref: "C1", kind: "C", nodes: ["n1", "gnd"], value: 31.831e-12 },
      { ref: "L2", kind: "L", nodes: ["n1", "n2"], value: 159.155e-9 },
      { ref: "C3", kind: "C", nodes: ["n2", "gnd"], value: 31.831e-12 },
    ],
  };
}

function caught(fn: () => unknown): EngineError {
  try {
    fn();
  } catch (e) {
    if (e instanceof EngineError) return e;
    throw new Error(`expected an EngineError, got ${String(e)}`);
  }
  throw new Error("expected an EngineError, nothing was thrown");
}

function expectInvalid(net: Netlist, message: RegExp, path: string): void {
  const err = caught(() => compileNetlist(net));
  expect(err.code).toBe("INVALID_NETLIST");
  expect(err.message).toMatch(message);
  expect(err.path).toBe(path);
}

describe("compileNetlist: one coded error per bad input", () => {
  it("accepts the base netlist", () => {
    expect(compileNetlist(base()).nodeNames).toEqual(["n1", "n2"]);
  });

  it("duplicate refs", () => {
    const net = base();
    net.parts[2].ref = "C1";
    expectInvalid(net, /part C1: duplicate ref/, "parts[2].ref");
  });

  it("a part whose two nodes are the same", () => {
    const net = base();
    net.parts[1].nodes = ["n1", "n1"];
    expectInvalid(net, /part L2: both ends are on node "n1"/, "parts[1].nodes");
  });

  for (const [label, value] of [["zero", 0], ["negative", -1e-9], ["NaN", Number.NaN], ["infinite", Number.POSITIVE_INFINITY]] as const) {
    it(`a ${label} value`, () => {
      const net = base();
      net.parts[1].value = value;
      expectInvalid(net, /part L2: value must be a finite number > 0/, "parts[1].value");
    });
  }

  it("a dangling node (reached by one part end only)", () => {
    const net = base();
    net.parts.push({ ref: "L4", kind: "L", nodes: ["n2", "n9"], value: 1e-9 });
    expectInvalid(net, /part L4: node "n9" is dangling/, "parts[3].nodes");
  });

  it("a floating island (no path to ground or a port)", () => {
    const net = base();
    net.parts.push({ ref: "R5", kind: "R", nodes: ["a", "b"], value: 10 }, { ref: "R6", kind: "R", nodes: ["b", "a"], value: 20 });
    expectInvalid(net, /part R5: node "a" is floating/, "parts[3].nodes");
  });

  it("a port on ground", () => {
    const net = base();
    net.ports[1].node = "gnd";
    expectInvalid(net, /port "out": node cannot be ground/, "ports[1].node");
  });

  it("a port whose node appears in no part (unknown node)", () => {
    const net = base();
    net.ports[1].node = "n7";
    expectInvalid(net, /port "out": node "n7" is not connected to any part/, "ports[1].node");
  });

  it("duplicate port names", () => {
    const net = base();
    net.ports[1].name = "in";
    expectInvalid(net, /port "in": duplicate port name/, "ports[1].name");
  });

  it("fewer than 2 ports", () => {
    const net = base();
    net.ports.pop();
    expectInvalid(net, /needs at least 2 ports \(has 1\)/, "ports");
  });

  it("a non-positive port z0", () => {
    const net = base();
    net.ports[0].z0 = 0;
    expectInvalid(net, /port "in": z0 must be a finite number > 0/, "ports[0].z0");
  });

  it("an unknown part kind", () => {
    const net = base();
    (net.parts[0] as { kind: string }).kind = "X";
    expectInvalid(net, /part C1: kind must be R, L or C/, "parts[0].kind");
  });

  it("a parasitic on the wrong kind of part", () => {
    const net = base();
    net.parts[1] = { ...net.parts[1], esr: 0.1 } as Part;
    expectInvalid(net, /part L2: esr applies only to capacitors/, "parts[1].esr");
  });
});

describe("SINGULAR_MATRIX", () => {
  it("a node held only by capacitors is singular at DC (f = 0)", () => {
    // n1 —R— n2 between the ports; n3 hangs between C4 (to n1) and C5 (to ground). At 0 Hz both
    // capacitors are open, so row n3 of Y is all zeros: Y is exactly singular.
    const net: Netlist = {
      ports: [
        { name: "in", node: "n1", z0: 50 },
        { name: "out", node: "n2", z0: 50 },
      ],
      parts: [
        { ref: "R1", kind: "R", nodes: ["n1", "n2"], value: 10 },
        { ref: "C4", kind: "C", nodes: ["n1", "n3"], value: 1e-12 },
        { ref: "C5", kind: "C", nodes: ["n3", "gnd"], value: 1e-12 },
      ],
    };
    const compiled = compileNetlist(net);
    const ev = createSweepEvaluator(compiled, new Float64Array([0, 1e6]));
    const err = caught(() => ev.evaluate(nominalValues(compiled)));
    expect(err.code).toBe("SINGULAR_MATRIX");
    expect(err.message).toMatch(/singular at 0 Hz/);
    expect(err.message).toMatch(/node "n3"/);
    expect(err.details).toEqual({ freq: 0, node: "n3" });
    // The same network is regular at 1 MHz.
    const ok = createSweepEvaluator(compiled, new Float64Array([1e6])).evaluate(nominalValues(compiled));
    expect(Number.isFinite(ok.s[0]) && Number.isFinite(ok.gd[0])).toBe(true);
  });

  it("an LC tank node with no other connection is singular at its resonance", () => {
    // Node t is held only by L3 ∥ C4 to ground: Y_tt = j(ωC − 1/(ωL)) vanishes at f0 = 1/(2π√(LC))
    // and row t is otherwise empty, so Y is singular there (up to rounding of ωC − 1/(ωL)).
    const L = 100e-9;
    const C = 25.330295910584444e-12; // [C] = 1/((2π·100 MHz)²·L), so f0 = 100 MHz (tests/fixtures/generators/closed_form_values.py)
    const net: Netlist = {
      ports: [
        { name: "in", node: "a", z0: 50 },
        { name: "out", node: "b", z0: 50 },
      ],
      parts: [
        { ref: "R1", kind: "R", nodes: ["a", "b"], value: 10 },
        { ref: "L3", kind: "L", nodes: ["t", "gnd"], value: L },
        { ref: "C4", kind: "C", nodes: ["t", "gnd"], value: C },
      ],
    };
    const f0 = 1 / (2 * Math.PI * Math.sqrt(L * C));
    const compiled = compileNetlist(net);
    const err = caught(() => createSweepEvaluator(compiled, new Float64Array([1e6, f0])).evaluate(nominalValues(compiled)));
    expect(err.code).toBe("SINGULAR_MATRIX");
    expect(err.message).toContain(`singular at ${f0} Hz`);
    expect(err.details?.freq).toBe(f0);
    // 0.1 % off resonance the tank has a finite (large) impedance and the sweep solves.
    const ok = createSweepEvaluator(compiled, new Float64Array([f0 * 1.001])).evaluate(nominalValues(compiled));
    expect(ok.s.every(Number.isFinite)).toBe(true);
  });

  it("rejects 0 Hz for a netlist with an ideal inductor (a DC short) as INVALID_INPUT", () => {
    const compiled = compileNetlist(base());
    const err = caught(() => createSweepEvaluator(compiled, new Float64Array([0])));
    expect(err.code).toBe("INVALID_INPUT");
    expect(err.message).toMatch(/inductor L2 is a short circuit/);
    expect(err.path).toBe("freqs[0]");
  });
});

describe("netlistSchema (JSON edge)", () => {
  it("accepts the base netlist", () => {
    expect(netlistSchema.safeParse(base()).success).toBe(true);
  });
  const bad: Array<[string, (n: Netlist) => void, string]> = [
    ["a bad ref character", (n) => (n.parts[0].ref = "C 1"), "parts.0.ref"],
    ["a 33-character ref", (n) => (n.parts[0].ref = "C".repeat(33)), "parts.0.ref"],
    ["tolerance above 0.5", (n) => (n.parts[0].tolerance = 0.6), "parts.0.tolerance"],
    ["negative toleranceAbs", (n) => (n.parts[0].toleranceAbs = -1e-13), "parts.0.toleranceAbs"],
    ["an unknown E series", (n) => ((n.parts[0] as { series: string }).series = "E7"), "parts.0.series"],
    ["q.at of 0", (n) => (n.parts[1].q = { value: 30, at: 0 }), "parts.1.q.at"],
    ["non-finite z0", (n) => (n.ports[0].z0 = Number.POSITIVE_INFINITY), "ports.0.z0"],
    ["one port", (n) => n.ports.pop(), "ports"],
    ["a misspelt field", (n) => ((n.parts[0] as unknown as Record<string, number>).tolerence = 0.1), "parts.0"],
    ["a 121-character name", (n) => (n.name = "x".repeat(121)), "name"],
  ];
  for (const [label, mutate, path] of bad) {
    it(`rejects ${label} at ${path}`, () => {
      const net = base();
      mutate(net);
      const r = netlistSchema.safeParse(net);
      expect(r.success).toBe(false);
      expect(r.error?.issues.map((i) => i.path.join("."))).toContain(path);
    });
  }
  it("rejects more than 500 parts", () => {
    const net = base();
    for (let k = 0; k < 500; k++) net.parts.push({ ref: `R${k}`, kind: "R", nodes: ["n1", "n2"], value: 1 });
    expect(netlistSchema.safeParse(net).success).toBe(false);
  });
});
