import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdirSync } from "node:fs";
import type { Browser, Page } from "playwright-core";
import { ARTIFACTS, launchBrowser, signedInPage } from "./browser";
import { baseUrl, signIn } from "../support/http";
import { DEMO_CIRCUITS } from "../../app/services/demo-data.server";

let browser: Browser;
let crossingId: number;
// The demo crossing that the seed studies (the first of the first demo circuit).
const DEMO_CROSSING = DEMO_CIRCUITS[0].crossings[0].name;

beforeAll(async () => {
  browser = await launchBrowser();
  mkdirSync(ARTIFACTS, { recursive: true });
  const engineer = await signIn("engineer@example.com");
  const { rows } = await (await engineer.get("/api/v1/portfolio")).json();
  const row = rows.find((r: { crossing: string; circuit: string }) => r.crossing === DEMO_CROSSING && r.circuit === DEMO_CIRCUITS[0].circuit.name);
  expect(row?.studyId).toBeTruthy();
  crossingId = row.crossingId;
});
afterAll(async () => {
  await browser?.close();
});

async function signInAs(email: string, to: string): Promise<Page> {
  const page = await signedInPage(browser, email, { to });
  await page.waitForLoadState("networkidle");
  return page;
}

describe("review and sign-off in the browser", () => {
  it("an engineer submits a demo crossing; the manager finds it on the home page and approves it", async () => {
    const engineer = await signInAs("engineer@example.com", `/crossings/${crossingId}`);
    const panel = engineer.getByTestId("review-panel");
    await panel.getByLabel("Note for the manager").fill("Browser test: ready for sign-off.");
    await panel.getByRole("button", { name: "Submit for sign-off" }).click();
    await engineer.getByTestId("review-state").filter({ hasText: "Submitted for sign-off" }).waitFor();
    expect(await engineer.getByTestId("review-history").textContent()).toContain("draft → submitted");
    await engineer.screenshot({ path: `${ARTIFACTS}/review-submitted.png`, fullPage: true });
    await engineer.context().close();

    const manager = await signInAs("manager@example.com", "/");
    const awaiting = manager.getByTestId("work-awaiting");
    const link = awaiting.getByRole("link", { name: new RegExp(DEMO_CROSSING) });
    await link.waitFor();
    await manager.screenshot({ path: `${ARTIFACTS}/review-manager-home.png`, fullPage: true });
    await link.click();
    await manager.waitForURL(`${baseUrl()}/crossings/${crossingId}`);
    await manager.waitForLoadState("networkidle");
    const decision = manager.getByTestId("review-panel");
    // Without a comment the approval is refused beside the field.
    await decision.getByRole("button", { name: "Approve" }).click();
    await decision.getByText("Write a comment.").waitFor();
    await decision.getByLabel("Comment").fill("Approved in the browser test.");
    await decision.getByRole("button", { name: "Approve" }).click();
    await manager.getByTestId("review-state").filter({ hasText: "Approved" }).waitFor();
    expect(await decision.textContent()).toContain("approved by Morgan Manager");
    expect(await manager.getByTestId("review-history").textContent()).toContain("submitted → approved");
    await manager.screenshot({ path: `${ARTIFACTS}/review-approved.png`, fullPage: true });

    // The approved study's report is offered from the crossing, and the PDF downloads.
    const reportLink = manager.getByTestId("approved-report").getByRole("link", { name: "Report (PDF)" });
    const pdf = await manager.request.get(new URL((await reportLink.getAttribute("href"))!, baseUrl()).toString());
    expect(pdf.status()).toBe(200);
    expect(pdf.headers()["content-type"]).toBe("application/pdf");
    expect((await pdf.body()).subarray(0, 5).toString()).toBe("%PDF-");

    // The portfolio shows the decision and filters by it (the view in the URL).
    await manager.goto(`${baseUrl()}/portfolio?review=approved`);
    const approvedRow = manager.getByRole("row").filter({ hasText: DEMO_CROSSING });
    await approvedRow.waitFor();
    expect(await approvedRow.textContent()).toContain("Approved");
    await manager.goto(`${baseUrl()}/portfolio?review=draft`);
    await manager.getByRole("table").first().waitFor();
    expect(await manager.getByRole("row").filter({ hasText: DEMO_CROSSING }).count()).toBe(0);

    // It no longer waits on the manager's home page.
    await manager.goto(`${baseUrl()}/`);
    expect(await manager.getByTestId("work-awaiting").getByRole("link", { name: new RegExp(DEMO_CROSSING) }).count()).toBe(0);
    await manager.context().close();
    // Two browser sessions and the first report PDF (its worker compiles the renderer on start):
    // 38 s measured at load average 14 on the shared 2-core machine, over the 30 s default.
  }, 90_000);
});
