// In the browser: the lights-on-the-supports option is costed for the support-light layout, and
// changing the span so the layout gains a level changes its units and costs on the crossing page.
// Levels: top, catenary low point, midway [published: Aeronautical Information Manual 2-2-3], more
// where two would be over 105 m apart, one light each [from memory: unconfirmed rule icao.support-light-levels].
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import type { Browser } from "playwright-core";
import { launchBrowser, signedInPage } from "./browser";
import { signIn } from "../support/http";
import { TOWER_LIGHTS_OPTION } from "../support/support-lights-option";

let browser: Browser;
let crossingId: number;
let optionId: number;
const name = `Browser tall river ${randomUUID().slice(0, 6)}`;

beforeAll(async () => {
  browser = await launchBrowser();
  const engineer = await signIn("engineer@example.com");
  const circuit = await engineer.json("/api/v1/circuits", "POST", { name: `Browser supports ${randomUUID().slice(0, 6)}`, voltageKv: 400, phases: 3 });
  const created = await engineer.json(`/api/v1/circuits/${(await circuit.json()).id}/crossings`, "POST", { name, lat: 46.9, lon: 7.4, spanLength: { value: 3000, unit: "m" }, kind: "river", ruleSet: "icao" });
  crossingId = (await created.json()).id;
  const detailsSaved = await engineer.json(`/api/v1/crossings/${crossingId}/details`, "PUT", { ruleSet: "icao", supportHeightA: 300, supportHeightB: 300, attachmentHeightA: 290, attachmentHeightB: 290 });
  expect(detailsSaved.status).toBe(200);
  const option = await engineer.json(`/api/v1/crossings/${crossingId}/options`, "POST", TOWER_LIGHTS_OPTION);
  expect(option.status).toBe(201);
  optionId = (await option.json()).id;
});
afterAll(async () => {
  await browser?.close();
});

describe("lights on the supports", () => {
  it("cost what the support-light layout counts, and follow a span change", async () => {
    const page = await signedInPage(browser, "engineer@example.com", { to: `/crossings/${crossingId}` });
    const units = page.getByTestId(`option-units-${optionId}`);
    const row = page.locator(`[data-testid="options-comparison"] tr:has([data-testid="option-units-${optionId}"])`);
    // Span 3,000 m: sag 90 m (3 %), low point 200 m, 100 m below the tops → 3 levels × 2 supports = 6 lights.
    await expect.poll(() => units.innerText()).toContain("from the support-light layout: 2 structures × 3 levels × 1 light per level = 6");
    expect((await units.innerText()).split("\n")[0]).toBe("6");
    // Capital 6 × 2,500 = 15,000; installation 3,000 + 240 × 4.5 h = 4,080.
    expect(await row.innerText()).toMatch(/15,000[\s\S]*4,080/);
    // The switch is on (an option prices the lights): the drawing and list show them, the notice lists their rules.
    await expect.poll(() => page.getByTestId("support-light-count").innerText()).toBe("6 lights");
    expect(await page.getByTestId("rule-book-notice").innerText()).toContain("Support-light levels and lights per level");
    await page.getByTestId("support-lights-toggle").uncheck();
    await expect.poll(() => page.getByTestId("rule-book-notice").innerText()).not.toContain("Support-light levels and lights per level");

    // Span 8,000 m: sag min(240, 232) = 232 m, low point 58 m, 242 m below the tops → 4 levels, 8 lights.
    await page.goto(page.url().replace(/\/crossings\/\d+$/, `/crossings/${crossingId}/edit`));
    await page.getByLabel("Span length").fill("8000");
    await page.getByRole("button", { name: "Save changes" }).click();
    await page.waitForURL(new RegExp(`/crossings/${crossingId}$`));
    await expect.poll(() => page.getByTestId(`option-units-${optionId}`).innerText()).toContain("= 8");
    // Capital 8 × 2,500 = 20,000; installation 3,000 + 240 × 6 h = 4,440.
    expect(await row.innerText()).toMatch(/20,000[\s\S]*4,440/);
    expect(await page.locator('[data-testid="span-elevation"] [data-support-light]').count()).toBe(8);
    await page.context().close();
  }, 90_000);
});
