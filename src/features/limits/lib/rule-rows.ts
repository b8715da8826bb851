import type { LimitRule } from "@shared/engine/limits";
import { formatSi, parseSi } from "@shared/units";

export const RULE_FIELDS = ["metric", "from", "to", "min", "max", "label"] as const;
export type RuleField = (typeof RULE_FIELDS)[number];
export const RULE_LABELS: Record<RuleField, string> = { metric: "Metric", from: "From", to: "To", min: "Min", max: "Max", label: "Label" };

/** Metrics a rule may test (port indices 1-based); units: dB, or ns for group delay. */
export const METRICS = [
  ["s21_db", "|S21| dB"], ["s11_db", "|S11| dB"], ["s22_db", "|S22| dB"], ["s12_db", "|S12| dB"],
  ["ripple_db", "S21 ripple dB (p-p)"], ["gd_ns", "S21 group delay ns"],
] as const;

/** A rule as typed: band edges with SI prefixes ("88M"), limits as plain numbers. */
export type RuleRow = { key: string } & Record<RuleField, string>;
export type RuleCheck = { rule: LimitRule | null; errors: Partial<Record<RuleField, string>> };

let seq = 0;
export function newRuleRow(partial: Partial<Record<RuleField, string>> = {}): RuleRow {
  seq += 1;
  return { key: `rule-${seq}`, metric: "s21_db", from: "", to: "", min: "", max: "", label: "", ...partial };
}

export function rowFromRule(rule: LimitRule): RuleRow {
  return newRuleRow({
    metric: rule.metric, from: formatSi(rule.from, "Hz"), to: formatSi(rule.to, "Hz"),
    min: rule.min === undefined ? "" : String(rule.min), max: rule.max === undefined ? "" : String(rule.max), label: rule.label ?? "",
  });
}

/** Checks one rule row (band from < to, min and/or max, min ≤ max) and builds the rule. */
export function checkRule(row: RuleRow): RuleCheck {
  const errors: RuleCheck["errors"] = {};
  const freq = (field: "from" | "to") => {
    try {
      const v = parseSi(row[field]);
      if (v > 0 && Number.isFinite(v)) return v;
      errors[field] = "Frequency must be > 0 Hz.";
    } catch {
      errors[field] = row[field].trim() ? `Cannot read "${row[field]}"; write e.g. 88M.` : "Frequency is required.";
    }
    return NaN;
  };
  const limit = (field: "min" | "max") => {
    if (row[field].trim() === "") return undefined;
    const v = Number(row[field]);
    if (!Number.isFinite(v)) errors[field] = "Write a number (dB or ns).";
    return v;
  };
  const from = freq("from");
  const to = freq("to");
  if (!errors.from && !errors.to && !(from < to)) errors.to = "The band must end above its start.";
  const min = limit("min");
  const max = limit("max");
  if (min === undefined && max === undefined) errors.min = "Give a min, a max or both.";
  if (min !== undefined && max !== undefined && min > max) errors.min = "Min is above max.";
  if (row.label.length > 120) errors.label = "At most 120 characters.";
  if (Object.keys(errors).length) return { rule: null, errors };
  const rule: LimitRule = { metric: row.metric, from, to };
  if (min !== undefined) rule.min = min;
  if (max !== undefined) rule.max = max;
  if (row.label.trim()) rule.label = row.label.trim();
  return { rule, errors };
}

const API_PATH = /^limits\.rules\.?\[?(\d+)\]?\.(\w+)$/;

/** Server field errors ("limits.rules[1].to" or "limits.rules.1.to") as { row: { field: message } }. */
export function apiRuleErrors(fields: Record<string, string> | undefined): Record<number, Partial<Record<RuleField, string>>> {
  const out: Record<number, Partial<Record<RuleField, string>>> = {};
  for (const [path, message] of Object.entries(fields ?? {})) {
    const m = API_PATH.exec(path);
    if (m && (RULE_FIELDS as readonly string[]).includes(m[2])) (out[Number(m[1])] ??= {})[m[2] as RuleField] = message;
  }
  return out;
}
