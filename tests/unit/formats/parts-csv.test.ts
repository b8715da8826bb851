import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import type { Part } from "../../../shared/engine/netlist";
import { PARTS_CSV_COLUMNS, parsePartsCsv, writePartsCsv } from "../../../shared/formats/parts-csv";
import { expectFormatError } from "../../helpers/expect-errors";

// Sources for expected numbers: SI prefixes per the SI Brochure (BIPM, 9th ed., Table 7);
// tolerance letter codes per IEC 60062:2016 (docs/references.md §7: B ±0.1 pF, C ±0.25 pF, D ±0.5 pF,
// F ±1 %, G ±2 %, J ±5 %, K ±10 %, M ±20 %; B/C/D also ±0.1/0.25/0.5 % on resistors); CSV quoting
// per RFC 4180 §2 (fields with commas, quotes or line breaks in double quotes, a quote doubled).

const fixture = (name: string) => readFileSync(new URL(`../../fixtures/formats/${name}`, import.meta.url), "utf8");
const HEAD = "ref,kind,node1,node2,value";


/** One-part table with extra columns. */
function one(extraHead: string, extraRow: string, base = "X1,C,a,gnd,10p"): string {
  return `${HEAD},${extraHead}\n${base},${extraRow}\n`;
}

describe("parsePartsCsv: the fixture with every column", () => {
  it("reads BOM, CRLF, a # comment line, a blank line, mixed-case headers and quoted fields", () => {
    const { parts, warnings } = parsePartsCsv(fixture("parts-sample.csv"));
    expect(warnings).toEqual([]); // C1 is 3.3 pF: a C code is unambiguous at ≤ 10 pF
    const expected: Part[] = [
      // C: ±0.25 pF absolute (IEC 60062); 0.5 nH = 5e-10 H (SI prefix n = 1e-9)
      { ref: "C1", kind: "C", nodes: ["in", "gnd"], value: 3.3e-12, toleranceAbs: 2.5e-13, distribution: "normal", series: "E24", lot: "reel-1", esr: 0.2, esl: 5e-10, tempco: 0 },
      // J: ±5 %; "reel ""7"", bin 2" is the RFC 4180 form of: reel "7", bin 2
      { ref: "L1", kind: "L", nodes: ["in", "out"], value: 22e-9, tolerance: 0.05, distribution: "uniform", series: "E12", lot: 'reel "7", bin 2', q: { value: 45, at: 250e6 }, srf: 2.4e9 },
      // 2% → 0.02; tolerance_abs 0.5p = 5e-13 F; "-30 ppm/°C" → −30
      { ref: "C2", kind: "C", nodes: ["out", "gnd"], value: 33e-12, tolerance: 0.02, toleranceAbs: 5e-13, series: "E24", lot: "reel-1", esr: 0.15, esl: 0.4e-9, tempco: -30 },
      // F: ±1 %; 1.2k = 1200 Ω
      { ref: "R1", kind: "R", nodes: ["out", "gnd"], value: 1200, tolerance: 0.01, series: "E96", tempco: 100 },
    ];
    expect(parts).toEqual(expected);
  });
});

describe("parsePartsCsv: columns, cells and CSV syntax", () => {
  it("columns in any order, names case-insensitive and padded, only the required ones", () => {
    const { parts } = parsePartsCsv(" VALUE , Node2,node1,KIND,Ref\n4.7 nH,b,a,l,L7\n");
    expect(parts).toEqual([{ ref: "L7", kind: "L", nodes: ["a", "b"], value: 4.7e-9 }]);
  });

  it.each([
    ["33p", 33e-12],
    ["4.7 nH", 4.7e-9],
    ["1.2k", 1.2e3],
    ["2.4G", 2.4e9],
    ["4k7", 4700],
    ["1e-9", 1e-9],
  ])("value %j = %d (SI prefix, optional unit)", (text, value) => {
    expect(parsePartsCsv(`${HEAD}\nR1,R,a,b,${text}\n`).parts[0].value).toBe(value);
  });

  it.each([
    ["2%", 0.02],
    ["2 %", 0.02],
    ["±2%", 0.02],
    ["+/-2%", 0.02],
    ["0.02", 0.02],
    ["0.5%", 0.005],
    ["0", 0],
    ["F", 0.01],
    ["G", 0.02],
    ["J", 0.05],
    ["k", 0.1],
    ["M", 0.2],
  ])("tolerance %j = %d (fraction)", (text, tol) => {
    expect(parsePartsCsv(one("tolerance", text)).parts[0].tolerance).toBe(tol);
  });

  it.each([
    ["B", 0.1e-12],
    ["C", 0.25e-12],
    ["D", 0.5e-12],
  ])("tolerance %j on a capacitor is ±%d F absolute", (code, abs) => {
    const { parts, warnings } = parsePartsCsv(one("tolerance", code, "C9,C,a,gnd,4.7p"));
    expect(parts[0].toleranceAbs).toBe(abs);
    expect(parts[0].tolerance).toBeUndefined();
    expect(warnings).toEqual([]);
  });

  it.each([
    ["B", 0.001],
    ["C", 0.0025],
    ["D", 0.005],
  ])("tolerance %j on a resistor is a relative %d", (code, tol) => {
    expect(parsePartsCsv(one("tolerance", code, "R9,R,a,b,100")).parts[0].tolerance).toBe(tol);
  });

  it("B/C/D on a capacitor above 10 pF is read as pF with a warning (IEC 60062 caveat, docs/references.md §7)", () => {
    const { parts, warnings } = parsePartsCsv(one("tolerance", "C", "C9,C,a,gnd,100p"));
    expect(parts[0].toleranceAbs).toBe(0.25e-12);
    expect(warnings).toEqual(["line 2: tolerance: letter code C read as ±0.25 pF (IEC 60062); on a 100 pF capacitor it may have meant ±0.25 %"]);
  });

  it("LF-only line ends, whitespace-only and blank lines, # comments anywhere", () => {
    const text = `# parts\n\n${HEAD}\n   \nR1,R,a,b,1k\n# between\n\nR2,R,b,c,2k\n`;
    expect(parsePartsCsv(text).parts.map((p) => p.ref)).toEqual(["R1", "R2"]);
  });

  it("a quoted field with a line break; later line numbers still count physical lines", () => {
    const text = `${HEAD},lot\nR1,R,a,b,1k,"two\r\nlines"\nR2,R,b,c,4.7x,\n`;
    expectFormatError(() => parsePartsCsv(text), 'line 4: value: not a number with an SI prefix ("4.7x")', 4, "value");
    const ok = parsePartsCsv(`${HEAD},lot\nR1,R,a,b,1k,"two\nlines"\n`);
    expect(ok.parts[0].lot).toBe("two\nlines");
  });

  it("quoted cells: commas, doubled quotes, spaces around, an empty quoted cell", () => {
    const { parts } = parsePartsCsv(`${HEAD},lot,series\n"R1",R, "a" ,b,1.5k,"say ""hi"", ok",""\n`);
    expect(parts[0]).toEqual({ ref: "R1", kind: "R", nodes: ["a", "b"], value: 1500, lot: 'say "hi", ok' });
  });

  it("empty optional cells leave the fields out", () => {
    const all = PARTS_CSV_COLUMNS.join(",");
    const { parts } = parsePartsCsv(`${all}\nC1,C,a,gnd,1n,,,,,,,,,,,,\n`);
    expect(parts[0]).toEqual({ ref: "C1", kind: "C", nodes: ["a", "gnd"], value: 1e-9 });
  });

  it("500 parts are accepted", () => {
    const rows = Array.from({ length: 500 }, (_, k) => `R${k},R,n${k},n${k + 1},1k`);
    expect(parsePartsCsv(`${HEAD}\n${rows.join("\n")}\n`).parts.length).toBe(500);
  });
});

describe("parsePartsCsv errors (one named test each: message, line, field)", () => {
  it("501 parts", () => {
    const rows = Array.from({ length: 501 }, (_, k) => `R${k},R,n${k},n${k + 1},1k`);
    expectFormatError(() => parsePartsCsv(`${HEAD}\n${rows.join("\n")}\n`), "line 502: ref: too many parts: at most 500 parts are supported", 502, "ref");
  });

  it("an empty file", () => {
    expectFormatError(() => parsePartsCsv("\uFEFF\r\n# nothing\r\n"), "line 1: header: the file is empty (a header row is required: ref,kind,node1,node2,value,…)", 1, "header");
  });

  it("a header without parts", () => {
    expectFormatError(() => parsePartsCsv(`# c\n${HEAD}\n`), "line 2: header: the file has a header but no parts", 2, "header");
  });

  it("unknown columns, named", () => {
    expectFormatError(
      () => parsePartsCsv(`${HEAD},Tolerence,colour\nR1,R,a,b,1k,5%,red\n`),
      `line 1: header: unknown columns "tolerence", "colour" (known: ${PARTS_CSV_COLUMNS.join(", ")})`, 1, "header",
    );
  });

  it("a column twice", () => {
    expectFormatError(() => parsePartsCsv(`${HEAD},Value\nR1,R,a,b,1k,2k\n`), 'line 1: header: column "value" appears twice', 1, "header");
  });

  it("required columns missing", () => {
    expectFormatError(() => parsePartsCsv("ref,kind,value\nR1,R,1k\n"), "line 1: header: missing required columns node1, node2", 1, "header");
  });

  it("a row with the wrong number of fields", () => {
    expectFormatError(() => parsePartsCsv(`${HEAD}\nR1,R,a,b,1k,5%\n`), "line 2: row: 6 fields but the header has 5 columns", 2, "row");
  });

  it("an unclosed quote", () => {
    expectFormatError(() => parsePartsCsv(`${HEAD}\nR1,R,"a,b,1k\n`), 'line 2: row: a quoted field is not closed (missing ")', 2, "row");
  });

  it("text after a closing quote", () => {
    expectFormatError(() => parsePartsCsv(`${HEAD}\nR1,R,"a"b,b,1k\n`), 'line 2: row: text after a closing quote (write a quote inside a quoted field as "")', 2, "row");
  });

  it("ref empty", () => {
    expectFormatError(() => parsePartsCsv(`${HEAD}\n,R,a,b,1k\n`), "line 2: ref: required", 2, "ref");
  });

  it("ref with a space", () => {
    expectFormatError(() => parsePartsCsv(`${HEAD}\nR 1,R,a,b,1k\n`), 'line 2: ref: "R 1" must be 1–32 letters, digits, _ . -', 2, "ref");
  });

  it("ref twice", () => {
    expectFormatError(() => parsePartsCsv(`${HEAD}\nR1,R,a,b,1k\n\nR1,R,b,c,1k\n`), 'line 4: ref: duplicate ref "R1" (first on line 2)', 4, "ref");
  });

  it("kind not R, L or C", () => {
    expectFormatError(() => parsePartsCsv(`${HEAD}\nQ1,Q,a,b,1k\n`), 'line 2: kind: must be R, L or C (got "Q")', 2, "kind");
  });

  it("node1 empty", () => {
    expectFormatError(() => parsePartsCsv(`${HEAD}\nR1,R,,b,1k\n`), "line 2: node1: required", 2, "node1");
  });

  it("node name too long", () => {
    expectFormatError(() => parsePartsCsv(`${HEAD}\nR1,R,a,${"n".repeat(65)},1k\n`), "line 2: node2: at most 64 characters", 2, "node2");
  });

  it("both nodes the same", () => {
    expectFormatError(() => parsePartsCsv(`${HEAD}\nR1,R,a,a,1k\n`), 'line 2: node2: same node as node1 ("a")', 2, "node2");
  });

  it("value not a number with an SI prefix", () => {
    expectFormatError(() => parsePartsCsv(`${HEAD}\nR1,R,a,b,1k\nR2,R,a,b,1k\nR3,R,a,b,4.7x\n`), 'line 4: value: not a number with an SI prefix ("4.7x")', 4, "value");
  });

  it("value not positive", () => {
    expectFormatError(() => parsePartsCsv(`${HEAD}\nR1,R,a,b,0\n`), 'line 2: value: must be > 0 (got "0")', 2, "value");
  });

  it("tolerance not readable", () => {
    expectFormatError(() => parsePartsCsv(one("tolerance", "5 percent")), 'line 2: tolerance: not a tolerance ("5 percent"; write 2%, 0.02, a letter code F G J K M, B C D or an absolute value such as 0.25p)', 2, "tolerance");
  });

  it("tolerance negative", () => {
    expectFormatError(() => parsePartsCsv(one("tolerance", "-2%")), 'line 2: tolerance: must be ≥ 0 (got "-2%")', 2, "tolerance");
  });

  it("tolerance above ±50 % (a bare 5 is not 5 %)", () => {
    expectFormatError(() => parsePartsCsv(one("tolerance", "5")), 'line 2: tolerance: ±500 % is above the ±50 % limit ("5"; for 5 % write "5%")', 2, "tolerance");
  });

  it("tolerance letter Z (asymmetric)", () => {
    expectFormatError(() => parsePartsCsv(one("tolerance", "Z")), "line 2: tolerance: letter code Z (+80/−20 %) is asymmetric and not supported", 2, "tolerance");
  });

  it("tolerance letter B on an inductor", () => {
    expectFormatError(() => parsePartsCsv(one("tolerance", "B", "L1,L,a,b,2n")), "line 2: tolerance: letter code B is ambiguous on an inductor; write the tolerance as a percentage or an absolute value", 2, "tolerance");
  });

  it("tolerance letter C together with tolerance_abs", () => {
    expectFormatError(() => parsePartsCsv(one("tolerance,tolerance_abs", "C,0.1p")), 'line 2: tolerance: "C" is an absolute tolerance and tolerance_abs is also given', 2, "tolerance");
  });

  it("tolerance_abs negative", () => {
    expectFormatError(() => parsePartsCsv(one("tolerance_abs", "-0.1p")), 'line 2: tolerance_abs: must be ≥ 0 (got "-0.1p")', 2, "tolerance_abs");
  });

  it("distribution unknown", () => {
    expectFormatError(() => parsePartsCsv(one("distribution", "gauss")), 'line 2: distribution: must be normal or uniform (got "gauss")', 2, "distribution");
  });

  it("series unknown", () => {
    expectFormatError(() => parsePartsCsv(one("series", "E25")), 'line 2: series: must be one of E3, E6, E12, E24, E48, E96, E192 (got "E25")', 2, "series");
  });

  it("lot too long", () => {
    expectFormatError(() => parsePartsCsv(one("lot", "x".repeat(33))), "line 2: lot: at most 32 characters", 2, "lot");
  });

  it("q on a capacitor", () => {
    expectFormatError(() => parsePartsCsv(one("q,q_at", "40,100M")), "line 2: q: applies only to inductors (X1 is C)", 2, "q");
  });

  it("q without q_at", () => {
    expectFormatError(() => parsePartsCsv(one("q,q_at", "40,", "L1,L,a,b,2n")), "line 2: q_at: q is given without q_at (the frequency the Q is specified at)", 2, "q_at");
  });

  it("q_at without q", () => {
    expectFormatError(() => parsePartsCsv(one("q,q_at", ",100M", "L1,L,a,b,2n")), "line 2: q: q_at is given without q", 2, "q");
  });

  it("q not positive", () => {
    expectFormatError(() => parsePartsCsv(one("q,q_at", "0,100M", "L1,L,a,b,2n")), 'line 2: q: must be > 0 (got "0")', 2, "q");
  });

  it("q not a number", () => {
    expectFormatError(() => parsePartsCsv(one("q,q_at", "high,100M", "L1,L,a,b,2n")), 'line 2: q: not a number ("high")', 2, "q");
  });

  it("q_at not a frequency", () => {
    expectFormatError(() => parsePartsCsv(one("q,q_at", "40,fast", "L1,L,a,b,2n")), 'line 2: q_at: not a number with an SI prefix ("fast")', 2, "q_at");
  });

  it("srf on a capacitor", () => {
    expectFormatError(() => parsePartsCsv(one("srf", "2G")), "line 2: srf: applies only to inductors (X1 is C)", 2, "srf");
  });

  it("esr on an inductor", () => {
    expectFormatError(() => parsePartsCsv(one("esr", "0.1", "L1,L,a,b,2n")), "line 2: esr: applies only to capacitors (L1 is L)", 2, "esr");
  });

  it("esl not a number with an SI prefix", () => {
    expectFormatError(() => parsePartsCsv(one("esl", "0.5 nanohenry")), 'line 2: esl: not a number with an SI prefix ("0.5 nanohenry")', 2, "esl");
  });

  it("tempco not a number", () => {
    expectFormatError(() => parsePartsCsv(one("tempco", "C0G")), 'line 2: tempco: not a number ("C0G")', 2, "tempco");
  });
});

describe("writePartsCsv", () => {
  const parts: Part[] = [
    { ref: "C1", kind: "C", nodes: ["in", "gnd"], value: 3.3e-12, toleranceAbs: 2.5e-13, distribution: "normal", series: "E24", lot: "reel-1", esr: 0.2, esl: 5e-10, tempco: 0 },
    { ref: "L1", kind: "L", nodes: ["in", "out"], value: 22e-9, tolerance: 0.05, distribution: "uniform", series: "E12", lot: 'reel "7", bin 2', q: { value: 45, at: 250e6 }, srf: 2.4e9 },
    { ref: "C2", kind: "C", nodes: ["out", "gnd"], value: 1 / 3 * 1e-10, tolerance: 0.07, toleranceAbs: 5e-13, tempco: -30 }, // 1/3·1e-10 has no short form
    { ref: "R1", kind: "R", nodes: ["out", "gnd"], value: 1200, tolerance: 0.0125, series: "E96", lot: " padded ", tempco: 1e-3 },
    { ref: "R2", kind: "R", nodes: ["#x", "y,z"], value: 4.7e-6 },
  ];

  it("round trip: every field, awkward strings and values read back equal", () => {
    const text = writePartsCsv(parts);
    expect(parsePartsCsv(text).parts).toEqual(parts);
  });

  it("writes the exact text for one part (hand-written expectation: SI prefix, CRLF, all columns)", () => {
    const text = writePartsCsv([{ ref: "L2", kind: "L", nodes: ["a", "b"], value: 4.7e-9, tolerance: 0.02, q: { value: 40, at: 1e8 } }]);
    expect(text).toBe(`${PARTS_CSV_COLUMNS.join(",")}\r\nL2,L,a,b,4.7n,0.02,,,,,40,100M,,,,,\r\n`);
  });

  it("rejects a part whose value is not finite (INVALID_INPUT)", () => {
    expect(() => writePartsCsv([{ ref: "R1", kind: "R", nodes: ["a", "b"], value: Number.NaN }])).toThrow(expect.objectContaining({ code: "INVALID_INPUT", field: "value" }));
  });
});

describe("parts CSV: grade column", () => {
  it("reads the grade code, writes it back, and refuses one longer than 40 characters", () => {
    const { parts } = parsePartsCsv("ref,kind,node1,node2,value,tolerance,grade\nC1,C,n1,gnd,33p,2%,G\nL2,L,n1,n2,68n,J,\n");
    expect(parts.map((p) => p.grade)).toEqual(["G", undefined]);
    expect(parsePartsCsv(writePartsCsv(parts)).parts).toEqual(parts);
    expect(() => parsePartsCsv(`ref,kind,node1,node2,value,grade\nC1,C,n1,gnd,33p,${"x".repeat(41)}\n`)).toThrow("line 2: grade: at most 40 characters");
  });
});
