import type { AppContext } from "../context";
import { Run, User } from "../entities";
import { createRun } from "../services/runs";
import { createSweep } from "../services/sweeps";
import type { DemoDesignsSummary } from "./demo-designs";

/** Seed of every demo run, so the demo's numbers are the same on every machine. */
const DEMO_SEED = 20261201;

/**
 * Queues the demo's runs when a demo design has none yet: one run per design, and for the harmonic low-pass a grade
 * sweep over the inductor grades (the passband match is what fails with ±5 % inductors). The server's run queue
 * works them off in the background, so a new user sees finished dashboards within a minute of `npm start`.
 */
export async function seedDemoRuns(ctx: AppContext, designs: DemoDesignsSummary["designs"], analystEmail: string): Promise<number> {
  const analyst = await ctx.dataSource.getRepository(User).findOneBy({ email: analystEmail });
  if (!analyst) return 0;
  let queued = 0;
  for (const d of designs) {
    if (!d.limitSetIds[0] || (await ctx.dataSource.getRepository(Run).existsBy({ designId: d.designId }))) continue;
    const base = { revisionId: d.revisionId, limitSetId: d.limitSetIds[0], trials: 4000, seed: DEMO_SEED };
    await createRun(ctx, analyst, { ...base, label: "as drawn" });
    queued += 1;
    if (d.name !== "VHF harmonic low-pass") continue;
    const inductors = (grade: string) => ({ L2: grade, L4: grade, L6: grade });
    const { runs } = await createSweep(ctx, { ...analyst, roles: analyst.roles, active: analyst.active }, {
      ...base,
      name: "Inductor grade",
      targetYield: 0.85,
      assignments: [
        { label: "L ±10 % (K)", gradeOverrides: inductors("K") },
        { label: "L ±5 % (J)", gradeOverrides: inductors("J") },
        { label: "L ±2 % (G)", gradeOverrides: inductors("G") },
      ],
    });
    queued += runs.length;
  }
  return queued;
}
