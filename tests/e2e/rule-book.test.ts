// Confirming a rule in the browser: the crossing page goes from "unconfirmed" to the
// confirmation. In an organisation of this test's own, so the demo's rule book is untouched.
// The colour sequence [from memory (AC 70/7460-1K ¶34.a(2)(b))] ships as "unconfirmed".
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdirSync } from "node:fs";
import { randomUUID } from "node:crypto";
import type { Browser } from "playwright-core";
import { ARTIFACTS, launchBrowser, signedInPage } from "./browser";
import { baseUrl, DEMO_PASSWORD, signIn } from "../support/http";
import { testDb } from "../support/db";
import { closeDb } from "../../db/index";
import { Organisation, User } from "../../db/models";
import { hashPassword } from "../../lib/passwords";

const tag = randomUUID().slice(0, 8);
const consultantEmail = `rules-browser-${tag}@example.com`;
let browser: Browser;
let crossingId: number;

beforeAll(async () => {
  testDb();
  browser = await launchBrowser();
  mkdirSync(ARTIFACTS, { recursive: true });
  const org = await Organisation.create({ name: `Rule book browser ${tag}` });
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  await User.create({ organisationId: org.id, email: consultantEmail, name: "Noor Nakamura", role: "consultant", passwordHash });
  await User.create({ organisationId: org.id, email: `rules-browser-eng-${tag}@example.com`, name: "Eng", role: "engineer", passwordHash });
  const engineer = await signIn(`rules-browser-eng-${tag}@example.com`);
  const circuit = await (await engineer.json("/api/v1/circuits", "POST", { name: `Browser rules ${tag}`, voltageKv: 138, phases: 3 })).json();
  const created = await engineer.json(`/api/v1/circuits/${circuit.id}/crossings`, "POST", { name: "Rules river", lat: 39.9, lon: -97.1, spanLength: { value: 1000, unit: "ft" }, kind: "river" });
  crossingId = (await created.json()).id;
});
afterAll(async () => {
  await browser?.close();
  await closeDb();
});

describe("rule book in the browser", () => {
  it("a consultant follows the crossing's notice, confirms the rule, and the crossing page shows the confirmation", async () => {
    const page = await signedInPage(browser, consultantEmail, { to: `/crossings/${crossingId}` });
    const status = page.getByTestId("rule-status-faa.colour-sequence");
    expect(await status.textContent()).toContain("unconfirmed: not yet checked");
    const notice = page.getByTestId("rule-book-notice");
    expect(await notice.textContent()).toContain("unconfirmed rules");
    await notice.getByRole("link", { name: /Confirm them in the rule book/ }).click();
    await page.waitForURL(`${baseUrl()}/rules/faa.colour-sequence`);
    await page.waitForLoadState("networkidle");
    await page.getByLabel("Edition").fill("M");
    await page.getByLabel("Paragraph").fill("¶3.5.1.4");
    await page.getByLabel("Checked on").fill("2026-12-03");
    await page.getByRole("button", { name: "Confirm rule" }).click();
    await page.getByText("Rule confirmed.").waitFor();
    const confirmed = "confirmed by Noor Nakamura on 2026-12-03 against AC 70/7460-1M ¶3.5.1.4";
    await page.screenshot({ path: `${ARTIFACTS}/rule-confirm-form.png`, fullPage: true });
    await page.getByTestId("rule-status-faa.colour-sequence").filter({ hasText: confirmed }).waitFor({ timeout: 10_000 });
    await page.goto(`${baseUrl()}/crossings/${crossingId}`);
    expect(await page.getByTestId("rule-status-faa.colour-sequence").textContent()).toBe(confirmed);
    expect(await page.getByTestId("rule-book-notice").textContent()).toContain("rests on an unconfirmed rule: Lighted catenary markers");
    await page.screenshot({ path: `${ARTIFACTS}/rule-confirmed.png`, fullPage: true });
  });
});
