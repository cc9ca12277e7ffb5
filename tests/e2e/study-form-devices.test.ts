// Issue 9 in the browser: the study form's insufficient-data warning, its phase default and selects
// that show their whole text (390 px and 1280 px); a harvest curve typed as a table; devices compared.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdirSync } from "node:fs";
import { randomUUID } from "node:crypto";
import type { Browser, Page } from "playwright-core";
import { ARTIFACTS, launchBrowser, signedInPage } from "./browser";
import { baseUrl } from "../support/http";
import { testDb } from "../support/db";
import { closeDb } from "../../db/index";
import { Crossing, User } from "../../db/models";

let browser: Browser;
let crossingId: number;

beforeAll(async () => {
  browser = await launchBrowser();
  mkdirSync(ARTIFACTS, { recursive: true });
  testDb();
  const organisationId = (await User.findOne({ where: { email: "engineer@example.com" } }))!.organisationId;
  // The demo's Glimmer River crossing: a three-phase circuit with a year of history.
  crossingId = (await Crossing.findOne({ where: { organisationId, name: "Glimmer River crossing" } }))!.id;
});
afterAll(async () => {
  await browser?.close();
  await closeDb();
});

/** Each select's chosen text against the room its box gives it (padding and the arrow taken off). */
async function cutSelects(page: Page) {
  return page.evaluate(() =>
    [...document.querySelectorAll("select")].flatMap((s) => {
      const style = getComputedStyle(s);
      const probe = document.createElement("span");
      probe.style.font = style.font;
      probe.style.whiteSpace = "pre";
      probe.textContent = s.selectedOptions[0]?.textContent ?? "";
      document.body.append(probe);
      const needed = probe.getBoundingClientRect().width;
      probe.remove();
      const room = s.clientWidth - parseFloat(style.paddingLeft) - parseFloat(style.paddingRight) - 16;
      return needed > room ? [`${s.name}: "${probe.textContent}" needs ${needed.toFixed(0)} px, has ${room.toFixed(0)} px`] : [];
    }),
  );
}

describe("study form", () => {
  for (const width of [390, 1280]) {
    it(`warns before a run that could only be insufficient data, defaults to the lowest phase, selects uncut (${width} px)`, async () => {
      const page = await signedInPage(browser, "engineer@example.com", { to: `/crossings/${crossingId}/studies/new`, width });
      await page.getByRole("heading", { name: "New feasibility study" }).waitFor();
      expect(await page.locator("#paramsPhase").inputValue()).toBe("min");
      await expect(page.getByText("Lowest of the three by default").isVisible()).resolves.toBe(true);
      expect(await cutSelects(page)).toEqual([]);
      const warning = page.getByTestId("insufficient-data-warning");
      // The whole profile meets the default policy; two days cannot (8,000 known hours needed).
      expect(await warning.count()).toBe(0);
      const profileText = await page.locator("#profileId + span").textContent();
      const start = /(\d{4}-\d{2}-\d{2})/.exec(profileText!)![1];
      const next = new Date(Date.parse(`${start}T00:00:00Z`) + 3 * 86_400_000).toISOString().slice(0, 10);
      await page.locator("#paramsPeriodStart").fill(start);
      await page.locator("#paramsPeriodEnd").fill(next);
      await warning.waitFor();
      expect(await warning.textContent()).toMatch(/about \d+ known hours of current, below the policy's minimum of 8,000.*could only be insufficient data/);
      await page.screenshot({ path: `${ARTIFACTS}/study-form-warning-${width}.png`, fullPage: true });
      await page.locator("#paramsPeriodStart").fill("");
      await page.locator("#paramsPeriodEnd").fill("");
      await warning.waitFor({ state: "detached" });
      await page.context().close();
    });
  }
});

describe("device profiles", () => {
  it("takes a harvest curve as a datasheet table, draws it on a log axis and compares it with another device", async () => {
    const page = await signedInPage(browser, "engineer@example.com", { to: "/devices/new" });
    const name = `Datasheet sphere ${randomUUID().slice(0, 6)}`;
    await page.getByLabel("Name").fill(name);
    await page.getByLabel("Table from a datasheet").check();
    const rows: [string, string][] = [["20", "0.5"], ["50", "2"], ["100", "6"]];
    for (const [i, [c, w]] of rows.entries()) {
      await page.getByLabel(`Row ${i + 1} current (A)`).fill(c);
      await page.getByLabel(`Row ${i + 1} power (W)`).fill(w);
    }
    await page.getByRole("button", { name: "Add row" }).click();
    await page.getByLabel("Row 4 current (A)").fill("400");
    await page.getByLabel("Row 4 power (W)").fill("12");
    const curve = page.getByTestId("harvest-curve");
    await curve.locator(".recharts-line path").first().waitFor();
    // Log axis: decade ticks 10 A, 100 A, 1,000 A are drawn, and the labels do not overlap.
    await curve.locator(".recharts-cartesian-axis-tick-value").first().waitFor();
    // Recharts 3 draws tick labels in their own layer, not inside the axis group: the current axis's end in " A".
    const ticks = (await curve.locator(".recharts-cartesian-axis-tick-value").allTextContents()).filter((t) => t.endsWith(" A"));
    expect(ticks).toEqual(expect.arrayContaining(["10 A", "100 A", "1,000 A"]));
    const boxes = await curve.locator(".recharts-label, .recharts-cartesian-axis-tick-value").evaluateAll((els) => els.map((e) => e.getBoundingClientRect()).map((r) => [r.left, r.right, r.top, r.bottom]));
    for (let i = 0; i < boxes.length; i++)
      for (let j = i + 1; j < boxes.length; j++) {
        const [a, b] = [boxes[i], boxes[j]];
        const overlap = a[0] < b[1] - 1 && b[0] < a[1] - 1 && a[2] < b[3] - 1 && b[2] < a[3] - 1;
        expect(overlap, `labels ${i} and ${j} overlap`).toBe(false);
      }
    await page.screenshot({ path: `${ARTIFACTS}/device-table.png`, fullPage: true });
    await page.getByRole("button", { name: "Create device profile" }).click();
    await page.waitForURL(/\/devices\/\d+$/);
    const id = Number(page.url().split("/").pop());

    await page.goto(`${baseUrl()}/devices`);
    await page.getByLabel(`Compare ${name}`).check();
    await page.getByLabel("Compare Lit sphere LS-40 (no storage)").check();
    await page.getByRole("button", { name: "Compare the ticked curves" }).click();
    await page.waitForURL(new RegExp(`compare=${id}`));
    const comparison = page.getByTestId("device-comparison");
    await comparison.locator(".recharts-line").nth(1).waitFor();
    expect(await comparison.locator(".recharts-line").count()).toBe(2);
    expect(await comparison.locator("tbody tr").count()).toBe(2);
    await page.screenshot({ path: `${ARTIFACTS}/device-compare.png`, fullPage: true });

    // A read-only role sees the values as text, not disabled inputs.
    const manager = await signedInPage(browser, "manager@example.com", { to: `/devices/${id}` });
    await manager.getByTestId("device-values").waitFor();
    expect(await manager.locator("input:disabled, fieldset:disabled").count()).toBe(0);
    expect(await manager.getByRole("cell", { name: "400" }).count()).toBe(1);
    await manager.context().close();
    await page.context().close();
  });
});
