import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { User } from "../../server/entities";
import { createDesign } from "../../server/services/designs";
import { ARTIFACTS, person, signedInPage, startE2e, type E2e } from "../helpers/browser";
import { ORIGIN } from "../helpers/test-context";
import { sampleNetlist } from "../integration/access-samples/designs";

// Issue 10 ("Trust"), item 5, in Chromium: a measured response named after a hostile file name is overlaid on the
// nominal plot and the plot is hovered; the tooltip shows the name as text and adds no element of its own.

let e: E2e;
beforeAll(async () => {
  e = await startE2e({ demoDesigns: false });
}, 90_000);
afterAll(() => e?.close());

/** A matched two-port over 1 MHz–1 GHz, 61 log-spaced points, so the overlay spans the nominal plot. */
function touchstone(): string {
  const rows = Array.from({ length: 61 }, (_, k) => `${(10 ** (k / 20)).toPrecision(6)} -25 0 -0.5 -90 -0.5 -90 -25 0`);
  return `! hostile name test\n# MHz S DB R 50\n${rows.join("\n")}\n`;
}

const HOSTILE = ["<img src=x onerror=window.__lotwisePwned=1>", "<svg onload=window.__lotwisePwned=2>"];

describe("chart tooltips in Chromium", () => {
  it("show a hostile series name as text and add no <img>/<svg> to the page", async () => {
    const designer = await e.t.ctx.dataSource.getRepository(User).findOneByOrFail({ email: person("designer").email });
    const { design } = await createDesign(e.t.ctx, designer, { name: "Tooltip escape low-pass", netlist: sampleNetlist() });
    const cookie = (await e.t.ctx.sessions.create(designer.id)).split(";")[0];
    for (const name of HOSTILE) {
      await request(e.t.app).post(`/api/designs/${design.id}/measured`).set("Origin", ORIGIN).set("Cookie", cookie)
        .attach("file", Buffer.from(touchstone()), `${name}.s2p`).expect(201);
    }

    const page = await signedInPage(e, "designer");
    await page.goto(`${e.base}/designs/${design.id}`);
    await page.getByRole("heading", { name: "Tooltip escape low-pass" }).waitFor();
    const count = () => page.evaluate(() => document.querySelectorAll("img, svg").length);
    const tooltipElements = () => page.evaluate(() =>
      [...document.querySelectorAll<HTMLElement>("div")].filter((d) => d.style.zIndex === "9999999").flatMap((d) => [...d.querySelectorAll("img, svg, script")].map((x) => x.tagName)));
    for (const [k, name] of HOSTILE.entries()) {
      await page.getByRole("radio", { name }).check();
      await page.waitForFunction(() => document.querySelectorAll("canvas").length >= 2, undefined, { timeout: 20_000 });
      await page.waitForTimeout(500);
      const before = await count();
      const canvas = page.locator("canvas").first();
      await canvas.scrollIntoViewIfNeeded();
      const box = (await canvas.boundingBox())!;
      let shown = "";
      for (const fx of [0.3, 0.45, 0.6]) {
        await page.mouse.move(box.x + box.width * fx, box.y + box.height * 0.5, { steps: 4 });
        await page.waitForTimeout(250);
        shown = await page.evaluate(() => [...document.querySelectorAll<HTMLElement>("div")].filter((d) => d.style.zIndex === "9999999").map((d) => d.innerText).join("\n"));
        if (shown.includes("|S21|")) break;
      }
      await page.screenshot({ path: `${ARTIFACTS}/tooltip-escape-${k + 1}.png` });
      expect(await tooltipElements()).toEqual([]);
      expect(await count()).toBe(before);
      expect(shown).toContain(`|S21| ${name}`); // the name, as text
      expect(await page.evaluate(() => (window as unknown as { __lotwisePwned?: number }).__lotwisePwned)).toBeUndefined();
      await page.mouse.move(0, 0);
    }
    expect(e.foreign).toEqual([]);
  }, 120_000);
});
