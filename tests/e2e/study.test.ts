import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdirSync } from "node:fs";
import type { Browser } from "playwright-core";
import { ARTIFACTS, launchBrowser, signedInPage } from "./browser";
import { baseUrl, signIn } from "../support/http";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
  mkdirSync(ARTIFACTS, { recursive: true });
});
afterAll(async () => {
  await browser?.close();
});

describe("study results", () => {
  it("a demo study's what-if recomputes without a page reload when the minimum current changes", async () => {
    // The seed studies the Hollowmere Canyon crossing (night load dips below 40 A in spring) with the 40 A sphere.
    const api = await signIn("engineer@example.com");
    const { rows } = await (await api.get("/api/v1/portfolio")).json();
    const hollowmere = rows.find((r: { crossing: string }) => r.crossing === "Hollowmere Canyon");
    expect(hollowmere).toBeTruthy();
    const studies = await (await api.get(`/crossings/${hollowmere.crossingId}`)).text();
    const firstStudy = [...studies.matchAll(/\/studies\/(\d+)/g)].map((m) => Number(m[1])).sort((a, b) => a - b)[0];

    const page = await signedInPage(browser, "engineer@example.com");
    const context = page.context();
    // Nothing on the page (fonts, scripts, styles) may be refused by the Content-Security-Policy.
    const refused: string[] = [];
    page.on("console", (m) => {
      if (m.type() === "error" && m.text().includes("Content Security Policy")) refused.push(m.text().slice(0, 160));
    });

    await page.goto(`${baseUrl()}/studies/${firstStudy}`);
    await page.getByText("Planning aid only.").waitFor({ state: "visible" });
    await page.getByRole("heading", { name: "Verdict" }).waitFor({ state: "visible" });
    await page.evaluate(() => document.fonts.ready);
    expect(refused).toEqual([]);
    // Marks the document so a full reload would be noticed.
    await page.evaluate(() => ((window as unknown as { __noReload: boolean }).__noReload = true));

    await page.getByLabel("Minimum current (A)").fill("10");
    await page.getByRole("button", { name: "Recompute" }).click();
    const result = page.getByTestId("what-if-result");
    await result.waitFor();
    const saved = await result.locator("tr", { hasText: "Dark hours" }).locator("td").nth(1).textContent();
    const changed = await result.locator("td[data-figure='Dark hours']").textContent();
    expect(saved).not.toBe(changed);
    expect(parseFloat(changed!.replace(/,/g, ""))).toBeLessThan(parseFloat(saved!.replace(/,/g, "")));
    expect(await page.evaluate(() => (window as unknown as { __noReload?: boolean }).__noReload)).toBe(true);
    // The charts are redrawn from the what-if, labelled so, with the way back to the saved ones.
    await page.getByTestId("what-if-banner").waitFor();
    const whatIfCharts = page.getByTestId("what-if-charts");
    await whatIfCharts.getByText("What-if: load-duration curve").waitFor();
    await whatIfCharts.getByText("What-if: required hours by month: lit, dark, unknown").waitFor();
    expect(await page.getByTestId("saved-charts").count()).toBe(0);
    await page.screenshot({ path: `${ARTIFACTS}/study-what-if.png`, fullPage: true });
    await page.getByRole("button", { name: "Back to the saved study's charts" }).click();
    await page.getByTestId("saved-charts").getByText("Load-duration curve", { exact: true }).waitFor();
    expect(await page.getByTestId("what-if-charts").count()).toBe(0);
    await page.getByRole("button", { name: "Show the what-if charts again" }).click();
    await page.getByTestId("what-if-charts").waitFor();

    // Another device profile on the same study: its own figures fill in, and the answer names it.
    const choose = page.getByLabel("Device profile");
    // Not simply the second option: devices other tests create may sort before the study's own,
    // and one whose minimum is the 10 A typed above could not show the figure giving way.
    const current = await choose.inputValue();
    const { devices } = await (await api.get("/api/v1/devices?limit=200")).json();
    const minOf = new Map<string, number>(devices.map((d: { id: number; spec: { minCurrentA: number } }) => [String(d.id), d.spec.minCurrentA]));
    const values = await choose.locator("option").evaluateAll((options) => options.map((o) => (o as HTMLOptionElement).value));
    const otherValue = values.find((v) => v !== current && minOf.has(v) && minOf.get(v) !== 10)!;
    expect(otherValue, "another device profile whose minimum current is not 10 A").toBeTruthy();
    const other = (await choose.locator(`option[value="${otherValue}"]`).textContent())!.trim();
    await choose.selectOption(otherValue);
    // The typed figure gives way to the chosen device's own.
    await page.waitForFunction(() => (document.getElementById("wi-min") as HTMLInputElement | null)?.value !== "10", undefined, { timeout: 10_000 });
    const otherMin = await page.getByLabel("Minimum current (A)").inputValue();
    expect(otherMin).not.toBe("10");
    await page.getByRole("button", { name: "Recompute" }).click();
    await page.getByTestId("what-if-banner").getByText(`device ${other}`).waitFor();
    await result.getByRole("columnheader", { name: `What-if (${other})` }).waitFor();
    expect(await page.evaluate(() => (window as unknown as { __noReload?: boolean }).__noReload)).toBe(true);
    await context.close();
  });
});
