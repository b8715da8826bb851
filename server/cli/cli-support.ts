/**
 * Shared pieces of the lotwise command line: usage errors, SI-number options, JSON input files
 * (a path or "-" for stdin) and the output helpers.
 */
import { readFileSync } from "node:fs";
import { EngineError } from "../../shared/engine/errors";
import { parseSi } from "../../shared/units";
import { fieldPath } from "../../shared/schemas/field-path";

/** A mistake in how the command was called (exit code 2). */
export class CliUsageError extends Error {}

/** A problem with an input file or its content (exit code 1), reported with the file name. */
export class CliInputError extends Error {}

/** Parsed option values as node:util parseArgs returns them. */
export type OptionValues = Record<string, string | boolean | undefined>;

/** Reads a required string option. */
export function requireOption(values: OptionValues, name: string): string {
  const v = values[name];
  if (typeof v !== "string" || v === "") throw new CliUsageError(`missing --${name}`);
  return v;
}

/** Reads an SI-prefixed number option ("2G", "100M", "4k7"), or undefined when absent. */
export function siOption(values: OptionValues, name: string): number | undefined {
  const v = values[name];
  if (v === undefined) return undefined;
  if (typeof v !== "string") throw new CliUsageError(`--${name} needs a value`);
  try {
    return parseSi(v);
  } catch {
    throw new CliUsageError(`--${name}: cannot read "${v}" as a number (SI prefixes allowed, e.g. 100M, 2.2n)`);
  }
}

/** Reads an integer option (SI prefixes allowed: "10k" = 10000). */
export function intOption(values: OptionValues, name: string): number | undefined {
  const x = siOption(values, name);
  if (x === undefined) return undefined;
  if (!Number.isInteger(x)) throw new CliUsageError(`--${name} must be an integer (got ${String(values[name])})`);
  return x;
}

/** Reads one of a fixed set of words. */
export function choiceOption<T extends string>(values: OptionValues, name: string, choices: readonly T[]): T | undefined {
  const v = values[name];
  if (v === undefined) return undefined;
  if (typeof v !== "string" || !(choices as readonly string[]).includes(v)) throw new CliUsageError(`--${name} must be one of ${choices.join(", ")}`);
  return v as T;
}

/**
 * Reads and parses a JSON file ("-" reads stdin; at most one input may be "-").
 * @param label what the file is ("netlist", "limits"), used in messages
 */
export function readJsonInput(path: string, label: string, stdinUsed: { used: boolean }): unknown {
  let text: string;
  try {
    if (path === "-") {
      if (stdinUsed.used) throw new CliUsageError("only one input may be read from stdin (-)");
      stdinUsed.used = true;
      text = readFileSync(0, "utf8");
    } else {
      text = readFileSync(path, "utf8");
    }
  } catch (err) {
    if (err instanceof CliUsageError) throw err;
    throw new CliInputError(`cannot read ${label} file "${path}": ${(err as NodeJS.ErrnoException).code ?? (err as Error).message}`);
  }
  try {
    return JSON.parse(text);
  } catch (err) {
    throw new CliInputError(`${label} file "${path}" is not valid JSON: ${(err as Error).message}`);
  }
}

/** Checks parsed JSON with a zod-like schema and names the first problem. */
export function checkWithSchema<T>(schema: { safeParse(v: unknown): { success: true; data: T } | { success: false; error: { issues: { path: PropertyKey[]; message: string }[] } } }, value: unknown, label: string): T {
  const res = schema.safeParse(value);
  if (res.success) return res.data;
  const issue = res.error.issues[0];
  const path = fieldPath(issue.path);
  throw new CliInputError(`${label}${path ? ` ${path}` : ""}: ${issue.message}`);
}

/** Prints one JSON object on stdout. */
export function printJson(value: unknown): void {
  process.stdout.write(`${JSON.stringify(value)}\n`);
}

/** One-line message for any error the CLI reports, and its exit code. */
export function describeError(err: unknown): { message: string; exitCode: number } {
  if (err instanceof CliUsageError) return { message: err.message, exitCode: 2 };
  if (err instanceof CliInputError) return { message: err.message, exitCode: 1 };
  if (err instanceof EngineError) return { message: `${err.code}${err.path ? ` at ${err.path}` : ""}: ${err.message}`, exitCode: 1 };
  if (err instanceof Error && (err as NodeJS.ErrnoException).code?.startsWith("ERR_PARSE_ARGS")) return { message: err.message, exitCode: 2 };
  return { message: `unexpected failure: ${err instanceof Error ? err.message : String(err)}`, exitCode: 1 };
}

/** Formats a number for human-readable tables. */
export function fmt(x: number | null | undefined, digits = 4): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return "—";
  return Number(x.toPrecision(digits)).toString();
}

/** Prints a command's help text; resolves the exit code 0. */
export function help(text: string): number {
  process.stdout.write(`${text}\n`);
  return 0;
}
