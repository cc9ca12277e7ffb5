// A manager's portfolio in the browser: the map shows the demo crossing as a link, the sort and
// filters go into the URL, a count tile opens its filtered view; the study report downloads as a PDF
// and the night calendar links a night to the current chart.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { readFileSync } from "node:fs";
import type { Browser } from "playwright-core";
import { launchBrowser, signedInPage } from "./browser";
import { baseUrl, signIn } from "../support/http";
import { DEMO_CIRCUITS } from "../../app/services/demo-data.server";
import { pdfText } from "../support/pdf";

let browser: Browser;
let crossingId: number;
let studyId: number;
const DEMO_CROSSING = DEMO_CIRCUITS[0].crossings[0].name;

beforeAll(async () => {
  browser = await launchBrowser();
  const manager = await signIn("manager@example.com");
  const { rows } = await (await manager.get("/api/v1/portfolio")).json();
  const row = rows.find((r: { crossing: string; circuit: string }) => r.crossing === DEMO_CROSSING && r.circuit === DEMO_CIRCUITS[0].circuit.name);
  crossingId = row.crossingId;
  studyId = row.studyId;
  expect(studyId).toBeTruthy();
});
afterAll(async () => {
  await browser?.close();
});

describe("portfolio in the browser", () => {
  it("shows the crossing on the map, sorts and filters through the URL, and tiles open filtered views", async () => {
    const page = await signedInPage(browser, "manager@example.com", { to: "/portfolio" });
    await page.waitForLoadState("networkidle"); // hydrated: the map's buttons work
    const dot = page.locator(`[data-testid="crossings-map"] a[data-crossing="${crossingId}"]`);
    await dot.waitFor({ state: "attached" });
    await page.getByRole("button", { name: "Zoom in" }).click();
    await expect.poll(() => page.locator('[data-testid="crossings-map"] svg[role="group"]').getAttribute("viewBox"), { timeout: 10_000 }).not.toBe("0 0 800 480");

    await page.getByRole("link", { name: /Dark h \/ year/ }).click();
    await page.waitForURL(/sort=darkHoursPerYear/);
    await page.locator(`select[name="verdict"]`).selectOption("not-studied");
    await page.getByRole("button", { name: "Apply filters" }).click();
    await page.waitForURL(/verdict=not-studied/);
    expect(page.url()).toContain("sort=darkHoursPerYear");
    // The URL changes as the navigation starts; the filtered table renders just after.
    await expect.poll(() => page.locator(`[data-testid="portfolio-table"] tr[data-crossing="${crossingId}"]`).count(), { timeout: 10_000 }).toBe(0);

    await page.getByRole("link", { name: /: show them$/ }).first().click();
    await page.waitForURL(/\/portfolio\?verdict=go$/);
    await page.context().close();
  });

  it("downloads the study report as a PDF and opens a night on the current chart", async () => {
    const page = await signedInPage(browser, "manager@example.com", { to: `/studies/${studyId}` });
    const [download] = await Promise.all([page.waitForEvent("download"), page.getByRole("link", { name: "Report (PDF)" }).click()]);
    expect(download.suggestedFilename()).toBe(`duskline-study-${studyId}-report.pdf`);
    const read = await pdfText(new Uint8Array(readFileSync((await download.path())!)));
    expect(read.text).toContain(DEMO_CROSSING);

    const night = page.locator(".night-calendar a[data-status]").first();
    const href = await night.getAttribute("href");
    expect(href).toMatch(new RegExp(`^/studies/${studyId}\\?from=`));
    await night.click();
    await page.waitForURL(`${baseUrl()}${href!.replace(/&amp;/g, "&")}`);
    await page.context().close();
  });
});
