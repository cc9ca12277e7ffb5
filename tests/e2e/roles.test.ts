import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdirSync } from "node:fs";
import type { Browser } from "playwright-core";
import { ARTIFACTS, launchBrowser } from "./browser";
import { baseUrl, newAddress } from "../support/http";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
  mkdirSync(ARTIFACTS, { recursive: true });
});
afterAll(async () => {
  await browser?.close();
});

const ROLES = [
  { role: "admin", heading: "Administrator", nav: "People" },
  { role: "engineer", heading: "Utility engineer", nav: "Home" },
  { role: "consultant", heading: "Consultant", nav: "Home" },
  { role: "manager", heading: "Manager", nav: "Home" },
] as const;

describe("each demo role signs in and sees its home page", () => {
  for (const { role, heading, nav } of ROLES) {
    it(role, async () => {
      const context = await browser.newContext({ extraHTTPHeaders: { "x-forwarded-for": newAddress() }, viewport: { width: 1280, height: 800 } });
      const page = await context.newPage();
      await page.goto(baseUrl() + "/");
      expect(new URL(page.url()).pathname).toBe("/login");
      await page.getByLabel("E-mail").fill(`${role}@example.com`);
      await page.getByLabel("Password").fill("duskline-demo");
      await page.getByRole("button", { name: "Sign in" }).click();
      await page.waitForURL(baseUrl() + "/");
      // waitFor retries until the element is visible (the machine may be busy); it throws on timeout.
      await page.getByText(heading, { exact: true }).first().waitFor({ state: "visible", timeout: 15_000 });
      await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: nav }).waitFor({ state: "visible", timeout: 15_000 });
      const adminLink = await page.getByRole("link", { name: "People" }).count();
      expect(adminLink > 0).toBe(role === "admin");
      await page.screenshot({ path: `${ARTIFACTS}/home-${role}.png`, fullPage: true });
      await page.getByRole("button", { name: "Sign out" }).click();
      await page.waitForURL(baseUrl() + "/login");
      await context.close();
    });
  }
});
