import type { Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import request from "supertest";
import { synthesizeLadder } from "../../shared/engine/synthesis/index";
import { DEMO_PEOPLE } from "../../server/seed/demo";
import { ARTIFACTS, signIn as signInForm, startE2e, type E2e } from "../helpers/browser";
import { ORIGIN } from "../helpers/test-context";

// End to end in Debian's Chromium: a designer's design exists (made through the API); the demo planner
// opens its Limits screen, adds a limit set with two rules, sees both drawn as the mask over the nominal
// response, and the API returns the stored rules. Then the planner adds a grade to the catalogue.
// Screenshots go to tests/artifacts/e2e (git-ignored).

let e: E2e;
beforeAll(async () => {
  e = await startE2e({ demoDesigns: false });
}, 90_000);
afterAll(() => e?.close());

const signIn = (page: Page, email: string) => signInForm(page, e.base, email);

describe("planner in the browser", () => {
  it("adds a limit set with two rules and sees the mask; adds a grade", async () => {
    const { agent } = await e.t.signedInAgent(["designer"]);
    const netlist = synthesizeLadder({ family: "chebyshev", type: "lowpass", order: 5, cutoff: 80e6, rippleDb: 0.1 });
    const created = await agent.post("/api/designs").set("Origin", ORIGIN)
      .send({ name: "VHF low-pass", netlist, sweep: { from: 1e6, to: 1e9, points: 201, scale: "log" } }).expect(201);
    const designId: string = created.body.design.id;

    const planner = DEMO_PEOPLE.find((p) => p.roles.includes("planner"))!;
    const context = await e.browser.newContext({ viewport: { width: 1440, height: 1000 } });
    const page = await context.newPage();
    const pageErrors: string[] = [];
    page.on("pageerror", (e) => pageErrors.push(e.message));
    await signIn(page, planner.email);
    await page.getByRole("link", { name: "Designs" }).click();
    await page.getByRole("link", { name: "VHF low-pass" }).click();
    await page.getByRole("link", { name: "Limits (0)" }).click();

    await page.getByLabel("Limit set name").fill("Harmonic mask");
    await page.getByLabel("Lot size").fill("500");
    await page.getByLabel("Metric, rule 1").selectOption("s21_db");
    await page.getByLabel("From, rule 1").fill("1M");
    await page.getByLabel("To, rule 1").fill("80M");
    await page.getByLabel("Min, rule 1").fill("-1");
    await page.getByLabel("Label, rule 1").fill("passband");
    await page.getByRole("button", { name: "Add rule" }).click();
    await page.getByLabel("From, rule 2").fill("300M");
    await page.getByLabel("To, rule 2").fill("80M");
    await expect.poll(() => page.getByLabel("To, rule 2").getAttribute("aria-invalid")).toBe("true"); // band ends below its start
    expect(await page.getByRole("button", { name: "Create limit set" }).isDisabled()).toBe(true);
    await page.getByLabel("To, rule 2").fill("1G");
    await page.getByLabel("Max, rule 2").fill("-40");
    await page.getByLabel("Label, rule 2").fill("harmonics");

    const mask = page.getByRole("list", { name: "Limit mask" }).first();
    await expect.poll(() => mask.getByRole("listitem").count()).toBe(2);
    expect(await mask.textContent()).toContain("harmonics: 300 MHz to 1 GHz, max -40");
    await page.getByRole("button", { name: "Create limit set" }).click();
    await page.getByText("Limit set saved.").waitFor();
    await page.waitForURL(/set=/);
    await page.waitForTimeout(300);
    await page.screenshot({ path: `${ARTIFACTS}/planner-1-limits.png`, fullPage: true });

    const stored = await request(e.t.app).get(`/api/designs/${designId}/limit-sets`).set("Cookie", (await context.cookies()).map((c) => `${c.name}=${c.value}`).join("; "));
    expect(stored.status).toBe(200);
    expect(stored.body.limitSets).toHaveLength(1);
    expect(stored.body.limitSets[0]).toMatchObject({ name: "Harmonic mask", lotSize: 500 });
    expect(stored.body.limitSets[0].limits.rules).toEqual([
      { metric: "s21_db", from: 1e6, to: 80e6, min: -1, label: "passband" },
      { metric: "s21_db", from: 300e6, to: 1e9, max: -40, label: "harmonics" },
    ]);

    await page.getByRole("link", { name: "Grades" }).click();
    await page.getByLabel("Kind").selectOption("C");
    await page.getByLabel("Code").fill("C0G-2");
    await page.getByLabel("Label").fill("C0G ±2 %");
    await page.getByLabel("Grade tolerance").fill("2%");
    await page.getByLabel("Cost each").fill("0.012");
    await page.getByRole("button", { name: "Add grade" }).click();
    await page.getByRole("cell", { name: "C0G-2", exact: true }).waitFor();
    await page.screenshot({ path: `${ARTIFACTS}/planner-2-grades.png`, fullPage: true });
    expect(pageErrors).toEqual([]);
    await context.close();
  }, 90_000);
});
