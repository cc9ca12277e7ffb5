// No page scrolls sideways at phone width (390 px): only a table may scroll, inside its own box.
// Also at 1280 px, where the marking references table used to overflow.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { launchBrowser, signedInPage } from "./browser";
import { baseUrl } from "../support/http";
import { testDb } from "../support/db";
import { closeDb } from "../../db/index";
import { Circuit, Crossing, DeviceProfile, LoadProfile, Study, User } from "../../db/models";

let browser: Browser;
let paths: string[];

beforeAll(async () => {
  browser = await launchBrowser();
  testDb();
  const organisationId = (await User.findOne({ where: { email: "engineer@example.com" } }))!.organisationId;
  const first = { where: { organisationId }, order: [["id", "ASC"]] as [string, string][] };
  const [circuit, crossing, study, profile, device] = await Promise.all([Circuit.findOne(first), Crossing.findOne(first), Study.findOne(first), LoadProfile.findOne(first), DeviceProfile.findOne(first)]);
  paths = [
    "/",
    "/circuits",
    `/circuits/${circuit!.id}`,
    `/circuits/${circuit!.id}/edit`,
    `/crossings/${crossing!.id}`,
    `/crossings/${crossing!.id}/details`,
    `/crossings/${crossing!.id}/studies/new`,
    `/crossings/${crossing!.id}/options/new`,
    `/studies/${study!.id}`,
    `/profiles/${profile!.id}`,
    "/devices",
    `/devices/${device!.id}`,
    "/portfolio",
    // Tables directly in a fieldset, and long unbreakable paths, used to push these sideways.
    "/optimise",
    `/crossings/${crossing!.id}/optimise`,
    "/docs/api",
  ];
});
afterAll(async () => {
  await browser?.close();
  await closeDb();
});


describe("pages fit the screen width", () => {
  it.each([390, 1280])("at %i px no page is wider than the screen", async (width) => {
    const page = await signedInPage(browser, "engineer@example.com", { width, height: 800 });
    const tooWide: string[] = [];
    for (const path of paths) {
      await page.goto(baseUrl() + path);
      await page.waitForLoadState("load");
      const scrollWidth = await page.evaluate(() => document.documentElement.scrollWidth);
      if (scrollWidth > width) tooWide.push(`${path}: ${scrollWidth} px`);
    }
    expect(tooWide).toEqual([]);
    await page.context().close();
    // Sixteen pages with their charts: minutes on a busy two-core machine.
  }, 240_000);

  it("at 390 px no admin page is wider than the screen (a table's visually hidden header text stays in its box)", async () => {
    const page = await signedInPage(browser, "admin@example.com", { width: 390, height: 800 });
    const tooWide: string[] = [];
    for (const path of ["/admin/users", "/admin/api-keys", "/admin/webhooks", "/admin/audit", "/admin/policy"]) {
      await page.goto(baseUrl() + path);
      await page.waitForLoadState("load");
      const scrollWidth = await page.evaluate(() => document.documentElement.scrollWidth);
      if (scrollWidth > 390) tooWide.push(`${path}: ${scrollWidth} px`);
    }
    expect(tooWide).toEqual([]);
    await page.context().close();
  }, 120_000);
});
