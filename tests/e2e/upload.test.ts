// Browser test of the load-history upload (issue 3): an engineer picks a historian CSV on a
// fresh circuit's page, sees the suggested mapping and a preview, uploads with a progress
// bar, and lands on the profile page with its quality report. A file whose dates fit both
// day-first and month-first order makes the form ask which.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { randomUUID } from "node:crypto";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { ARTIFACTS, launchBrowser, signedInPage } from "./browser";
import { baseUrl } from "../support/http";
import { generateLoadCsv } from "../../lib/demo/load-generator";
import { ingestCsvText } from "../../lib/ingest/ingest";
import { formatHours, formatPercent } from "../../shared/format";

let browser: Browser;
let dir: string;
beforeAll(async () => {
  browser = await launchBrowser();
  mkdirSync(ARTIFACTS, { recursive: true });
  dir = mkdtempSync(join(tmpdir(), "duskline-upload-"));
});
afterAll(async () => {
  await browser?.close();
  if (dir) rmSync(dir, { recursive: true, force: true });
});

/** A signed-in engineer on the page of a circuit created for this test. */
async function engineerOnFreshCircuit(phases: number): Promise<{ context: BrowserContext; page: Page; circuitId: number }> {
  const page = await signedInPage(browser, "engineer@example.com");
  const context = page.context();
  // page.request shares the browser context's session cookie.
  const res = await page.request.post(baseUrl() + "/api/v1/circuits", {
    data: { name: `Upload e2e ${randomUUID().slice(0, 8)}`, voltageKv: 69, phases },
  });
  expect(res.status()).toBe(201);
  const circuitId: number = (await res.json()).id;
  await page.goto(`${baseUrl()}/circuits/${circuitId}`);
  // The file input only reacts once React has hydrated it (it then carries React's props).
  await page.waitForFunction(() => {
    const input = document.getElementById("profile-file");
    return input !== null && Object.keys(input).some((k) => k.startsWith("__reactProps"));
  });
  return { context, page, circuitId };
}

/** Waits for the client-side move to the new profile's page; fails at once on the form's error box. */
async function landOnProfilePage(page: Page, timeoutMs: number): Promise<void> {
  const failure = page.getByRole("alert").filter({ hasText: "Nothing was saved." });
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    if (/^\/profiles\/\d+$/.test(new URL(page.url()).pathname)) return;
    if (await failure.count()) throw new Error(`The upload failed in the page: ${await failure.textContent()}`);
    await page.waitForTimeout(100);
  }
  await page.screenshot({ path: `${ARTIFACTS}/upload-no-profile-page.png`, fullPage: true });
  throw new Error(`No profile page within ${timeoutMs} ms; still on ${page.url()}`);
}

async function selectedValue(page: Page, id: string): Promise<string> {
  return page.locator(`#${id}`).inputValue();
}

describe("uploading a current history in the browser", () => {
  it("maps, previews, uploads with progress and shows the quality report", { timeout: 90_000 }, async () => {
    // Six weeks of 1-minute, 3-phase history (about 2.6 MB) with a 5-hour historian gap.
    const csv = generateLoadCsv({
      seed: 7,
      start: "2024-01-01T00:00:00Z",
      days: 42,
      intervalMinutes: 1,
      phases: 3,
      baseA: 180,
      dailySwingA: 50,
      seasonalSwingA: 20,
      gaps: [{ startDay: 10.25, hours: 5 }],
      metadata: ["Historian export (invented)", "Point: E2E-69 line current, UTC"],
    });
    const file = join(dir, "e2e-history.csv");
    writeFileSync(file, csv);
    const mapping = { timestampColumn: "Timestamp", phaseA: "IA [A]", phaseB: "IB [A]", phaseC: "IC [A]", qualityColumn: "Quality" };
    const expected = ingestCsvText(csv, mapping).quality;
    expect(expected.coverage).toBeLessThan(1); // the gap shows in the figure

    const { context, page } = await engineerOnFreshCircuit(3);
    await page.locator("#profile-file").setInputFiles(file);

    // Suggested mapping and preview, from the file's head in the browser.
    const preview = page.getByRole("table", { name: "Preview of the first rows" });
    await preview.waitFor();
    expect(await preview.locator("th").allTextContents()).toEqual(["Timestamp", "IA [A]", "IB [A]", "IC [A]", "Quality"]);
    expect(await preview.locator("tbody tr").first().locator("td").first().textContent()).toBe("2024-01-01 00:00:00");
    await expect(page.getByText("(2 line(s) before the header skipped)").isVisible()).resolves.toBe(true);
    expect(await selectedValue(page, "map-timestampColumn")).toBe("Timestamp");
    expect(await selectedValue(page, "map-phaseA")).toBe("IA [A]");
    expect(await selectedValue(page, "map-phaseB")).toBe("IB [A]");
    expect(await selectedValue(page, "map-phaseC")).toBe("IC [A]");
    expect(await selectedValue(page, "map-qualityColumn")).toBe("Quality");
    expect(await selectedValue(page, "map-name")).toBe("e2e-history");

    // Record every state of the progress bar and the parsing indicator as they render;
    // the navigation to the profile page is client-side, so the record survives it.
    await page.evaluate(() => {
      const seen = { progress: [] as { value: number; max: number }[], parsing: false };
      (window as unknown as { uploadSeen: typeof seen }).uploadSeen = seen;
      new MutationObserver(() => {
        const bar = document.getElementById("upload-progress") as HTMLProgressElement | null;
        if (bar) seen.progress.push({ value: bar.value, max: bar.max });
        if (document.querySelector('[role="status"]')?.textContent?.includes("Reading the samples")) seen.parsing = true;
      }).observe(document.body, { subtree: true, childList: true, attributes: true, characterData: true });
    });
    // Slow the upload so progress events fire part-way (Chromium's network emulation).
    const cdp = await context.newCDPSession(page);
    await cdp.send("Network.emulateNetworkConditions", { offline: false, latency: 0, downloadThroughput: -1, uploadThroughput: 1_500_000 });

    await page.getByRole("button", { name: "Upload and check quality" }).click();
    await page.locator("#upload-progress").waitFor({ timeout: 10_000 });
    await page.screenshot({ path: `${ARTIFACTS}/upload-progress.png`, fullPage: true });
    await landOnProfilePage(page, 60_000);
    await cdp.send("Network.emulateNetworkConditions", { offline: false, latency: 0, downloadThroughput: -1, uploadThroughput: -1 });

    const seen = await page.evaluate(() => (window as unknown as { uploadSeen: { progress: { value: number; max: number }[]; parsing: boolean } }).uploadSeen);
    expect(seen.progress.length).toBeGreaterThan(0);
    expect(seen.progress.every((p) => p.max === Buffer.byteLength(csv))).toBe(true);
    expect(seen.progress.some((p) => p.value > 0 && p.value < p.max)).toBe(true); // a progress event part-way
    expect(seen.parsing).toBe(true);

    // The profile page and its quality report.
    await page.getByRole("heading", { level: 1, name: "e2e-history" }).waitFor();
    const summary = page.getByRole("region", { name: "Quality summary" });
    await expect(summary.getByText(formatPercent(expected.coverage, 1), { exact: true }).isVisible()).resolves.toBe(true);
    const byMonth = page.locator("figure").filter({ has: page.getByText("Coverage by month", { exact: true }) });
    const january = expected.monthlyCoverage[0];
    expect(january.month).toBe("2024-01");
    await expect(byMonth.getByText(`2024-01: ${formatPercent(january.coverage, 1)}`, { exact: false }).isVisible()).resolves.toBe(true);
    await expect(summary.getByText(`${expected.gaps.count} · ${formatHours(expected.gaps.hours)}`, { exact: true }).isVisible()).resolves.toBe(true);
    await page.screenshot({ path: `${ARTIFACTS}/upload-profile.png`, fullPage: true });
    await context.close();
  });

  it("asks day-first or month-first for dates that fit both", { timeout: 60_000 }, async () => {
    // 1 to 12 February 2024 written day first, hourly: every day and month is ≤ 12.
    const lines = ["Date,Current [A]"];
    for (let day = 1; day <= 12; day++) {
      for (let hour = 0; hour < 24; hour++) lines.push(`${String(day).padStart(2, "0")}/02/2024 ${String(hour).padStart(2, "0")}:00,${(120 + hour).toFixed(1)}`);
    }
    const file = join(dir, "ambiguous-dates.csv");
    writeFileSync(file, lines.join("\n") + "\n");

    const { context, page } = await engineerOnFreshCircuit(1);
    await page.locator("#profile-file").setInputFiles(file);
    await page.getByRole("table", { name: "Preview of the first rows" }).waitFor();
    expect(await selectedValue(page, "map-timestampColumn")).toBe("Date");
    expect(await selectedValue(page, "map-currentColumn")).toBe("Current [A]");
    const format = page.locator("#map-format");
    expect(await format.inputValue()).toBe("");
    expect(await format.locator("option:checked").textContent()).toBe("Choose day-first or month-first…");
    await expect(page.getByRole("alert").filter({ hasText: "The dates could be day/month or month/day. Choose which." }).isVisible()).resolves.toBe(true);
    await page.screenshot({ path: `${ARTIFACTS}/upload-ambiguous-dates.png`, fullPage: true });

    // Choosing day first reads the file as 1–12 February.
    await format.selectOption("dmy");
    await page.getByRole("button", { name: "Upload and check quality" }).click();
    await landOnProfilePage(page, 30_000);
    await page.getByRole("heading", { level: 1, name: "ambiguous-dates" }).waitFor();
    // Month first would have read 2 January to 2 December.
    await expect(page.getByText("2024-02-01 00:00 UTC → 2024-02-12 23:00 UTC · phases A · 288 samples").isVisible()).resolves.toBe(true);
    await context.close();
  });
});
