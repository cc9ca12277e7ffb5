// Browser test of the profile chart's zoom (issue 9): phase and month buttons show which is
// selected (aria-pressed), switching phase keeps the zoom, dragging across the chart zooms into
// that stretch, and times show in the circuit's time zone.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdirSync } from "node:fs";
import { randomUUID } from "node:crypto";
import type { Browser } from "playwright-core";
import { ARTIFACTS, launchBrowser, signedInPage } from "./browser";
import { baseUrl } from "../support/http";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
  mkdirSync(ARTIFACTS, { recursive: true });
});
afterAll(async () => {
  await browser?.close();
});

describe("zooming the current chart", () => {
  it("keeps the month through a phase switch and zooms to a dragged stretch", { timeout: 90_000 }, async () => {
    const page = await signedInPage(browser, "engineer@example.com");
    const circuit = await (await page.request.post(baseUrl() + "/api/v1/circuits", { data: { name: `Zoom e2e ${randomUUID().slice(0, 8)}`, voltageKv: 110, phases: 3, timeZone: "Europe/Berlin" } })).json();
    const rows = ["Time,IL1,IL2,IL3"];
    for (let i = 0; i < 24 * 50; i++) rows.push(`${new Date(Date.UTC(2025, 2, 1) + i * 3_600_000).toISOString()},${100 + (i % 24)},${150 + (i % 12)},${90 + (i % 6)}`);
    const upload = await page.request.post(`${baseUrl()}/api/v1/circuits/${circuit.id}/profiles?timestampColumn=Time&phaseA=IL1&phaseB=IL2&phaseC=IL3&name=Zoom`, { data: rows.join("\n"), headers: { "content-type": "text/csv" } });
    expect(upload.status()).toBe(201);
    const id = (await upload.json()).profile.id;

    await page.goto(`${baseUrl()}/profiles/${id}?month=2025-03`);
    await page.waitForSelector(".recharts-surface");
    const phaseB = page.getByRole("button", { name: "Phase B" });
    expect(await page.getByRole("button", { name: "2025-03" }).getAttribute("aria-pressed")).toBe("true");
    expect(await phaseB.getAttribute("aria-pressed")).toBe("false");
    // 1 March 2025 00:00 UTC is 01:00 in Berlin (UTC+1).
    await expect(page.getByText("2025-03-01 01:00 UTC+1").first().isVisible()).resolves.toBe(true);

    await phaseB.click();
    await page.waitForURL(/phase=B/);
    await page.waitForFunction(() => document.querySelector('button[name="phase"][value="B"]')?.getAttribute("aria-pressed") === "true", null, { timeout: 10_000 });
    const afterSwitch = new URL(page.url());
    expect(afterSwitch.searchParams.get("month")).toBe("2025-03");
    expect(await page.getByRole("button", { name: "Phase B" }).getAttribute("aria-pressed")).toBe("true");
    expect(await page.getByRole("button", { name: "2025-03" }).getAttribute("aria-pressed")).toBe("true");

    // Drag across the middle of the chart: the URL gets that stretch, the phase stays.
    await page.waitForSelector(".recharts-surface");
    const box = (await page.locator(".recharts-surface").first().boundingBox())!;
    const y = box.y + box.height / 2;
    await page.mouse.move(box.x + box.width * 0.4, y);
    await page.mouse.down();
    for (let k = 1; k <= 8; k++) await page.mouse.move(box.x + box.width * (0.4 + (0.2 * k) / 8), y);
    await page.mouse.up();
    await page.waitForURL(/from=/);
    const zoomed = new URL(page.url());
    expect(zoomed.searchParams.get("phase")).toBe("B");
    expect(zoomed.searchParams.get("month")).toBeNull();
    const from = Date.parse(zoomed.searchParams.get("from")!);
    const to = Date.parse(zoomed.searchParams.get("to")!);
    // About a fifth of March, inside March.
    expect(from).toBeGreaterThan(Date.UTC(2025, 2, 1));
    expect(to).toBeLessThan(Date.UTC(2025, 3, 1));
    expect((to - from) / 86_400_000).toBeGreaterThan(3);
    expect((to - from) / 86_400_000).toBeLessThan(9);
    // No month is pressed once the dragged stretch is on show.
    await page.waitForFunction(() => document.querySelector('button[name="month"][value="2025-03"]')?.getAttribute("aria-pressed") === "false", null, { timeout: 10_000 });
    await page.screenshot({ path: `${ARTIFACTS}/zoom-dragged.png`, fullPage: true });

    // The Day link shows one local day of the stretch's first date.
    await page.getByRole("link", { name: "Day", exact: true }).click();
    await page.waitForURL((url) => url.searchParams.get("from") === url.searchParams.get("to"));
    expect(new URL(page.url()).searchParams.get("phase")).toBe("B");
    await page.context().close();
  });
});
