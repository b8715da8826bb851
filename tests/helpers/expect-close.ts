/**
 * Tolerance assertions for Lotwise tests. A check passes when |actual − expected| ≤ atol + rtol·|expected|
 * (complex: the same with moduli). On failure the message prints the label, the input (if given),
 * actual, expected, Δ and the tolerance, so a red test says how far off it is.
 */

export interface CloseOptions {
  /** Relative tolerance (default 1e-12). */
  rtol?: number;
  /** Absolute tolerance (default 0). */
  atol?: number;
  /** What is being compared, e.g. "|S21| at 1 GHz". */
  label?: string;
  /** The input that produced the value (printed on failure). */
  input?: unknown;
}

export interface ComplexLike {
  re: number;
  im: number;
}

/**
 * Assert that a number (or each element of an array) is close to the expected one.
 * @throws Error with label, input, actual, expected, Δ and tol when a value is outside the tolerance or NaN
 */
export function expectClose(actual: number | ArrayLike<number>, expected: number | ArrayLike<number>, options: CloseOptions = {}): void {
  const rtol = options.rtol ?? 1e-12;
  const atol = options.atol ?? 0;
  if (typeof actual === "number" || typeof expected === "number") {
    if (typeof actual !== "number" || typeof expected !== "number") {
      throw new Error(`${head(options)}cannot compare a number with an array`);
    }
    check(actual, expected, rtol, atol, options, "");
    return;
  }
  if (actual.length !== expected.length) {
    throw new Error(`${head(options)}length ${actual.length} ≠ expected length ${expected.length}`);
  }
  for (let i = 0; i < expected.length; i++) check(actual[i], expected[i], rtol, atol, options, `[${i}]`);
}

/**
 * Assert that a complex number is close to the expected one: |a − e| ≤ atol + rtol·|e|.
 * @throws Error with label, input, actual, expected, Δ and tol on failure
 */
export function expectComplexClose(actual: ComplexLike, expected: ComplexLike, options: CloseOptions = {}): void {
  const rtol = options.rtol ?? 1e-12;
  const atol = options.atol ?? 0;
  const delta = Math.hypot(actual.re - expected.re, actual.im - expected.im);
  const tol = atol + rtol * Math.hypot(expected.re, expected.im);
  if (!(delta <= tol)) {
    throw new Error(
      `${head(options)}not close${inputText(options)}\n  actual:   ${fmtC(actual)}\n  expected: ${fmtC(expected)}\n  Δ:        ${delta}\n  tol:      ${tol} (atol ${atol} + rtol ${rtol}·|expected|)`,
    );
  }
}

function check(a: number, e: number, rtol: number, atol: number, options: CloseOptions, where: string): void {
  if (a === e) return; // covers equal infinities
  const delta = Math.abs(a - e);
  const tol = atol + rtol * Math.abs(e);
  if (!(delta <= tol)) {
    throw new Error(
      `${head(options)}not close${where}${inputText(options)}\n  actual:   ${a}\n  expected: ${e}\n  Δ:        ${delta}\n  tol:      ${tol} (atol ${atol} + rtol ${rtol}·|expected|)`,
    );
  }
}

function head(options: CloseOptions): string {
  return options.label ? `${options.label}: ` : "";
}

function inputText(options: CloseOptions): string {
  if (options.input === undefined) return "";
  let text: string;
  try {
    text = JSON.stringify(options.input);
  } catch {
    text = String(options.input);
  }
  return `\n  input:    ${text.length > 2000 ? `${text.slice(0, 2000)}…` : text}`;
}

function fmtC(c: ComplexLike): string {
  return `${c.re} ${c.im >= 0 ? "+" : "−"} ${Math.abs(c.im)}j`;
}
