import type { RunResultView as RunResultJson } from "@shared/contracts";

/**
 * The rule that fails most often (ties: the lower Cpk, then the lower index); −1 when there are no rules.
 * Its margins are the ones the sensitivity ranking explains.
 */
export function mostFailingRule(result: RunResultJson): number {
  let best = -1;
  result.rules.forEach((rule, r) => {
    if (best < 0) return void (best = r);
    const b = result.rules[best];
    const cpk = (x: number | null) => (x === null ? Infinity : x);
    if (rule.failures > b.failures || (rule.failures === b.failures && cpk(rule.cpk) < cpk(b.cpk))) best = r;
  });
  return best;
}

/** Parts ranked by |Spearman ρ| between their relative deviation and the rule's margin, strongest first. */
export function sensitivityRanking(result: RunResultJson, rule: number): { ref: string; rho: number }[] {
  const rho = result.sensitivity.rho[rule] ?? [];
  return result.sensitivity.parts
    .map((ref, p) => ({ ref, rho: rho[p] ?? NaN }))
    .filter((x) => Number.isFinite(x.rho))
    .sort((a, b) => Math.abs(b.rho) - Math.abs(a.rho));
}

/** The envelope of metric `sIJ_db`, if the run stored one. */
export function envelopeOf(result: RunResultJson, metric: string) {
  return result.envelopes.series.find((s) => s.metric === metric) ?? null;
}
