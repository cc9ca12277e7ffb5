import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdirSync } from "node:fs";
import { randomUUID } from "node:crypto";
import type { Browser, Page } from "playwright-core";
import { ARTIFACTS, launchBrowser } from "./browser";
import { baseUrl, newAddress, signIn } from "../support/http";

let browser: Browser;
let crossingId: number;

beforeAll(async () => {
  browser = await launchBrowser();
  mkdirSync(ARTIFACTS, { recursive: true });
  // A crossing of its own, so the test does not depend on the demo seed.
  const engineer = await signIn("engineer@example.com");
  const circuit = await engineer.json("/api/v1/circuits", "POST", { name: `Browser crossing ${randomUUID().slice(0, 6)}`, voltageKv: 138, phases: 3 });
  const created = await engineer.json(`/api/v1/circuits/${(await circuit.json()).id}/crossings`, "POST", {
    name: "Browser river",
    lat: 39.9,
    lon: -97.1,
    spanLength: { value: 1000, unit: "ft" },
    kind: "river",
  });
  expect(created.status).toBe(201);
  crossingId = (await created.json()).id;
  // Two options through the page form, so the comparison and its chart show.
  const consultant = await signIn("consultant@example.com");
  const option = {
    units: "",
    installationMethod: "helicopter",
    mobilisation: "12000",
    ratePerHour: "4500",
    minutesPerUnit: "20",
    serviceLifeYears: "20",
    horizonYears: "40",
    discountRatePercent: "8",
  };
  const extras: Record<string, string>[] = [
    { name: "Line-fed markers", kind: "line-powered", unitPrice: "6500", annualMaintenance: "160" },
    { name: "Solar markers", kind: "solar", unitPrice: "4200", annualMaintenance: "600", serviceLifeYears: "10", feasibilityStatus: "go", feasibilityJustification: "Open site (test)." },
  ];
  for (const extra of extras) {
    expect((await consultant.post(`/crossings/${crossingId}/options/new`, { ...option, ...extra })).status).toBe(302);
  }
});
afterAll(async () => {
  await browser?.close();
});

const markerCount = (page: Page) => page.locator('[data-testid="span-elevation"] [data-marker]').count();

describe("crossing page", () => {
  it("draws the span with its markers and re-lays them out for a what-if span length", async () => {
    const context = await browser.newContext({ extraHTTPHeaders: { "x-forwarded-for": newAddress() }, viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    const consoleErrors: string[] = [];
    page.on("console", (m) => m.type() === "error" && consoleErrors.push(m.text()));
    await page.goto(`${baseUrl()}/login?redirectTo=${encodeURIComponent(`/crossings/${crossingId}`)}`);
    await page.getByLabel("E-mail").fill("consultant@example.com");
    await page.getByLabel("Password").fill("duskline-demo");
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.waitForURL(`${baseUrl()}/crossings/${crossingId}`);
    await page.waitForLoadState("networkidle");

    // FAA, 1,000 ft at ≤ 200 ft → 4 markers [published: AC 70/7460-1K ¶34.a(2)(a)].
    await page.locator('[data-testid="span-elevation"]').waitFor();
    expect(await markerCount(page)).toBe(4);
    expect(await page.getByTestId("marker-count").textContent()).toBe("4");
    const colours = await page.locator('[data-testid="span-elevation"] [data-marker]').evaluateAll((els) => els.map((e) => e.getAttribute("data-colour")));
    expect(colours).toEqual(["orange", "white", "yellow", "orange"]);

    // 2,000 ft → 10 intervals → 9 markers, computed in the browser without saving.
    const whatIf = page.getByTestId("whatif-span");
    await whatIf.fill("2000");
    await page.waitForFunction(() => document.querySelectorAll('[data-testid="span-elevation"] [data-marker]').length === 9, undefined, { timeout: 10_000 });
    expect(await page.getByTestId("marker-count").textContent()).toBe("9");
    await expect(page.getByText("What-if: 2,000 ft instead of the saved 1,000 ft. Not saved.").isVisible()).resolves.toBe(true);
    // The cumulative-cost chart draws after hydration, one line per option.
    await page.locator(".recharts-line").first().waitFor();
    expect(await page.locator(".recharts-line").count()).toBe(2);
    await expect(page.getByText("Recommended: Solar markers").isVisible()).resolves.toBe(true);
    await page.screenshot({ path: `${ARTIFACTS}/crossing-what-if.png`, fullPage: true });

    // Server and browser computed the same drawing: no hydration complaints.
    expect(consoleErrors.filter((e) => /hydrat/i.test(e))).toEqual([]);

    // Nothing was saved: a fresh load shows the saved span again.
    await page.reload();
    await page.locator('[data-testid="span-elevation"]').waitFor();
    expect(await markerCount(page)).toBe(4);

    // The details form opens from the layout section.
    await page.getByRole("link", { name: "Span and marking details" }).click();
    await page.waitForURL(`${baseUrl()}/crossings/${crossingId}/details`);
    await page.getByLabel("Highest wire", { exact: true }).waitFor();
    expect(await page.getByLabel("Rule set", { exact: true }).inputValue()).toBe("faa");
    await page.screenshot({ path: `${ARTIFACTS}/crossing-details.png`, fullPage: true });
    await context.close();
  });
});
