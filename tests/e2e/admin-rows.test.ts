// Per-row admin actions post with their own fetcher (issue 9 "Forms, one way"): the answer shows in
// the row that was changed, the row redraws with its new state, and the rest of the page stays.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import type { Browser } from "playwright-core";
import { launchBrowser, signedInPage } from "./browser";
import { testDb } from "../support/db";
import { closeDb } from "../../db/index";
import { User } from "../../db/models";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
  testDb();
});
afterAll(async () => {
  await browser?.close();
  await closeDb();
});

describe("people: row actions", () => {
  it("changes a role and deactivates an account with the answer in that row", { timeout: 60_000 }, async () => {
    const page = await signedInPage(browser, "admin@example.com", { to: "/admin/users" });
    const email = `rows-${randomUUID().slice(0, 8)}@example.com`;
    await page.getByLabel("Name", { exact: true }).fill("Row Person");
    await page.getByLabel("E-mail", { exact: true }).fill(email);
    await page.getByRole("button", { name: "Send invitation" }).click();
    const row = page.getByRole("row").filter({ hasText: email });
    await row.waitFor();

    await row.getByLabel("Role of Row Person").selectOption("consultant");
    await row.getByRole("button", { name: "Save" }).click();
    await row.getByRole("status").filter({ hasText: "Role changed." }).waitFor();
    expect((await User.findOne({ where: { email } }))!.role).toBe("consultant");

    await row.getByRole("button", { name: "Deactivate" }).click();
    await row.getByRole("status").filter({ hasText: "Account deactivated; its sessions have ended." }).waitFor();
    // The loaders ran again: the row now offers Reactivate and says Deactivated.
    await row.getByRole("button", { name: "Reactivate" }).waitFor();
    await row.getByRole("cell", { name: "Deactivated", exact: true }).waitFor();
    expect((await User.findOne({ where: { email } }))!.active).toBe(false);
    await page.context().close();
  });
});
