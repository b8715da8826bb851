import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Design, Run, User } from "../../server/entities";
import { DEMO_PEOPLE, seedDemo } from "../../server/seed/demo";
import { seedDemoDesigns } from "../../server/seed/demo-designs";
import { seedDemoRuns } from "../../server/seed/demo-runs";
import { createTestContext, type TestContext } from "../helpers/test-context";

let t: TestContext;
beforeAll(async () => {
  t = await createTestContext();
});
afterAll(() => t?.close());

const email = (role: string) => DEMO_PEOPLE.find((p) => p.roles.includes(role as never))!.email;

describe("demo seed", () => {
  it("adds the demo people, designs and queued runs once; a second seeding adds nothing", async () => {
    const ds = t.ctx.dataSource;
    expect(await seedDemo(ds)).toBe(DEMO_PEOPLE.length);
    const designer = await ds.getRepository(User).findOneByOrFail({ email: email("designer") });
    const first = await seedDemoDesigns(ds, { designer: designer.id });
    expect(first.designsAdded).toBe(3);
    const queued = await seedDemoRuns(t.ctx, first.designs, email("analyst"));
    expect(queued).toBe(3 + 3); // one run per design, plus a three-grade sweep of the harmonic low-pass

    expect(await seedDemo(ds)).toBe(0);
    const second = await seedDemoDesigns(ds, { designer: designer.id });
    expect(second.designsAdded).toBe(0);
    expect(await seedDemoRuns(t.ctx, second.designs, email("analyst"))).toBe(0);
    expect(await ds.getRepository(Design).count()).toBe(3);
    expect(await ds.getRepository(Run).count()).toBe(6);
    const mains = await ds.getRepository(Design).findOneByOrFail({ name: "Mains input filter" });
    expect(mains.stress).toBe("mains");
  });
});
