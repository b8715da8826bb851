import type { Design, DesignRevision, Run, User } from "../entities";
import type { RunDetail, RunEconomics, RunSummary } from "../../shared/contracts";

export type { RunEconomics, RunSummary };

/** What a run summary needs beyond the run row; taken from loaded relations when not given. */
export interface RunSummaryExtras {
  designName?: string;
  revisionNumber?: number;
  launchedBy?: { id: string; name: string };
}

type RunWithRelations = Run & { design?: Design; revision?: DesignRevision; launchedBy?: User };

/** The run as every list, page and compare view shows it (RunSummary of the workflow contract). */
export function presentRunSummary(run: RunWithRelations, extras: RunSummaryExtras = {}): RunSummary {
  const launcher = extras.launchedBy ?? (run.launchedBy ? { id: run.launchedBy.id, name: run.launchedBy.name } : { id: run.launchedById, name: "" });
  return {
    id: run.id,
    designId: run.designId,
    designName: extras.designName ?? run.design?.name ?? "",
    /** the design's use, for the safety cautions beside every result (null when the design row was not loaded) */
    designStress: run.design?.stress ?? null,
    revisionId: run.revisionId,
    revisionNumber: extras.revisionNumber ?? run.revision?.number ?? null,
    limitSetId: run.limitSetId,
    sweepId: run.sweepId,
    label: run.label,
    state: run.state,
    trialsDone: run.trialsDone,
    trialsTotal: run.trialsTotal,
    passed: run.passed,
    yield: run.yieldFraction,
    wilson95: run.wilsonLow !== null && run.wilsonHigh !== null ? ([run.wilsonLow, run.wilsonHigh] as [number, number]) : null,
    seed: (run.options as { seed?: number | string }).seed ?? null,
    launchedBy: { id: launcher.id, name: launcher.name },
    queuedAt: run.queuedAt.toISOString(),
    startedAt: run.startedAt?.toISOString() ?? null,
    finishedAt: run.finishedAt?.toISOString() ?? null,
    errorCode: run.errorCode,
    errorMessage: run.errorMessage,
    bomCost: run.bomCost,
    lotSize: run.lotSize,
    /** times the run was interrupted by a server stop and run again from its seed (the result is the same) */
    interruptions: run.interruptions ?? 0,
    lastInterruptedAt: run.lastInterruptedAt?.toISOString() ?? null,
  };
}

/**
 * Economics of a lot built from this run's netlist: every unit costs the BOM, only `yield` of them pass.
 * @returns null while the run has no yield
 */
export function runEconomics(run: Pick<Run, "lotSize" | "bomCost" | "yieldFraction">): RunEconomics | null {
  if (run.yieldFraction === null) return null;
  const bomCost = run.bomCost ?? 0;
  const expectedGood = run.lotSize * run.yieldFraction;
  const scrapUnits = run.lotSize - expectedGood;
  return {
    lotSize: run.lotSize,
    bomCost,
    expectedGood,
    scrapUnits,
    scrapCost: scrapUnits * bomCost,
    costPerGoodUnit: run.yieldFraction > 0 ? bomCost / run.yieldFraction : null,
  };
}

/** GET /api/runs/:id: the summary plus the run's copied inputs. */
export function presentRunDetail(run: RunWithRelations, extras: RunSummaryExtras = {}): RunDetail {
  return { ...presentRunSummary(run, extras), options: run.options, limits: run.limits, gradeOverrides: run.gradeOverrides, netlist: run.netlist };
}
