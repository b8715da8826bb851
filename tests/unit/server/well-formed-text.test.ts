import { describe, expect, it } from "vitest";
import { findUnpairedSurrogate, hasUnpairedSurrogate } from "../../../shared/schemas/well-formed-text";

// The check every request input passes (server/routes/api-router.ts parseInput, uploaded JSON files): lone UTF-16
// surrogates are found with their path; pairs (emoji, astral characters) are ordinary text.

describe("lone surrogates", () => {
  it("tells lone halves from pairs", () => {
    for (const bad of ["\ud800", "x\ud800y", "\udc00", "a\udfffb", "\ud83d", "\ude00\ud83d", "ok \ud83d\ude00 \ud800"]) expect(hasUnpairedSurrogate(bad)).toBe(true);
    for (const good of ["", "plain", "Ω µ °C", "\ud83d\ude00", "📡🔌", "\u{10FFFF}", "\uFFFD"]) expect(hasUnpairedSurrogate(good)).toBe(false);
  });

  it("gives the path of the string (or key) that holds one", () => {
    expect(findUnpairedSurrogate({ name: "fine", netlist: { ports: [{ name: "in" }, { name: "o\ud800ut" }] } })).toEqual(["netlist", "ports", 1, "name"]);
    expect(findUnpairedSurrogate({ a: ["x", "y"], b: { "k\udc00": 1 } })).toEqual(["b", "k\uFFFD"]);
    expect(findUnpairedSurrogate("\ud800")).toEqual([]);
    expect(findUnpairedSurrogate({ a: [1, null, true, { b: "📡" }], c: "ok" })).toBeNull();
    expect(findUnpairedSurrogate(null)).toBeNull();
  });

  it("walks a deeply nested value without exhausting the stack", () => {
    let deep: unknown = "\ud800";
    for (let i = 0; i < 200_000; i += 1) deep = [deep];
    expect(findUnpairedSurrogate(deep)).toHaveLength(200_000);
  });
});
