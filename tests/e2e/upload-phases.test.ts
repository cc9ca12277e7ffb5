// Browser test of three-phase names and files that are not CSV (issue 9): an L1/L2/L3 export on a
// three-phase circuit is mapped one column per phase and stored as three phases; mapping one
// column on a three-phase circuit is warned about before upload; an empty file and a PDF get a
// message instead of the mapping form.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { randomUUID } from "node:crypto";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { ARTIFACTS, launchBrowser, signedInPage } from "./browser";
import { baseUrl } from "../support/http";

let browser: Browser;
let dir: string;
beforeAll(async () => {
  browser = await launchBrowser();
  mkdirSync(ARTIFACTS, { recursive: true });
  dir = mkdtempSync(join(tmpdir(), "duskline-phases-"));
});
afterAll(async () => {
  await browser?.close();
  if (dir) rmSync(dir, { recursive: true, force: true });
});

async function engineerOnThreePhaseCircuit(): Promise<{ context: BrowserContext; page: Page }> {
  const page = await signedInPage(browser, "engineer@example.com");
  const context = page.context();
  const res = await page.request.post(baseUrl() + "/api/v1/circuits", { data: { name: `Phases e2e ${randomUUID().slice(0, 8)}`, voltageKv: 110, phases: 3 } });
  expect(res.status()).toBe(201);
  await page.goto(`${baseUrl()}/circuits/${(await res.json()).id}`);
  await page.waitForFunction(() => {
    const input = document.getElementById("profile-file");
    return input !== null && Object.keys(input).some((k) => k.startsWith("__reactProps"));
  });
  return { context, page };
}

function l123Csv(): string {
  const lines = ["Zeitstempel;I_L1 [A];I_L2 [A];I_L3 [A]"];
  const start = Date.UTC(2025, 3, 1);
  for (let i = 0; i < 96; i++) lines.push(`${new Date(start + i * 900_000).toISOString()};${(200 + i).toFixed(1)};${(150 + i).toFixed(1)};${(100 + i).toFixed(1)}`);
  return lines.join("\n") + "\n";
}

describe("three-phase names in the browser", () => {
  it("maps I_L1/I_L2/I_L3 one column per phase and stores three phases", { timeout: 60_000 }, async () => {
    const file = join(dir, "l123.csv");
    writeFileSync(file, l123Csv());
    const { context, page } = await engineerOnThreePhaseCircuit();
    await page.locator("#profile-file").setInputFiles(file);
    await page.getByRole("table", { name: "Preview of the first rows" }).waitFor();
    expect(await page.getByLabel("one column per phase").isChecked()).toBe(true);
    expect(await page.locator("#map-phaseA").inputValue()).toBe("I_L1 [A]");
    expect(await page.locator("#map-phaseB").inputValue()).toBe("I_L2 [A]");
    expect(await page.locator("#map-phaseC").inputValue()).toBe("I_L3 [A]");
    await page.getByRole("button", { name: "Upload and check quality" }).click();
    await page.waitForURL(/\/profiles\/\d+$/, { timeout: 30_000 });
    await page.getByText("phases A, B, C · 96 samples", { exact: false }).waitFor();
    const id = new URL(page.url()).pathname.split("/").pop();
    const stored = await (await page.request.get(`${baseUrl()}/api/v1/profiles/${id}`)).json();
    expect(stored.phases).toEqual(["A", "B", "C"]);
    expect(stored.mapping).toMatchObject({ phaseA: "I_L1 [A]", phaseB: "I_L2 [A]", phaseC: "I_L3 [A]" });
    await page.screenshot({ path: `${ARTIFACTS}/upload-l123.png`, fullPage: true });
    await context.close();
  });

  it("warns before uploading one column to a three-phase circuit", { timeout: 60_000 }, async () => {
    const file = join(dir, "l123-one.csv");
    writeFileSync(file, l123Csv());
    const { context, page } = await engineerOnThreePhaseCircuit();
    await page.locator("#profile-file").setInputFiles(file);
    await page.getByRole("table", { name: "Preview of the first rows" }).waitFor();
    await page.getByLabel("one column per phase").uncheck();
    await page.getByRole("button", { name: "Upload and check quality" }).click();
    const warning = page.getByRole("alert").filter({ hasText: "This circuit has 3 phases but the upload maps one column." });
    await warning.waitFor();
    expect(new URL(page.url()).pathname).toMatch(/^\/circuits\/\d+$/); // nothing sent yet
    await expect(page.getByRole("button", { name: "Upload anyway" }).isVisible()).resolves.toBe(true);
    await context.close();
  });

  it("says an empty file and a PDF are not CSV, before any mapping form", { timeout: 60_000 }, async () => {
    const empty = join(dir, "empty.csv");
    writeFileSync(empty, "");
    const pdf = join(dir, "export.pdf");
    writeFileSync(pdf, "%PDF-1.4\n%\xe2\xe3\xcf\xd3\n1 0 obj\n<< /Type /Catalog >>\nendobj\ntrailer\n%%EOF\n");
    const { context, page } = await engineerOnThreePhaseCircuit();
    await page.locator("#profile-file").setInputFiles(empty);
    await page.getByRole("alert").filter({ hasText: "Empty file" }).waitFor();
    expect(await page.getByText("has no content (0 bytes)").count()).toBe(1);
    await page.locator("#profile-file").setInputFiles(pdf);
    await page.getByRole("alert").filter({ hasText: "Not a CSV file" }).waitFor();
    expect(await page.getByText("export.pdf is a PDF document, not CSV text.", { exact: false }).count()).toBe(1);
    expect(await page.getByRole("table", { name: "Preview of the first rows" }).count()).toBe(0);
    expect(await page.locator("#map-timestampColumn").count()).toBe(0);
    await context.close();
  });
});
