// Debian's Chromium driven by playwright-core (no browser download). launch() gives every
// browser a fresh temporary profile, so no --user-data-dir is passed.
import { chromium, type Browser, type Page } from "playwright-core";
import { baseUrl, DEMO_PASSWORD, newAddress } from "../support/http";

export async function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: "/usr/bin/chromium",
    headless: true,
    args: [
      "--no-sandbox",
      "--disable-gpu",
      "--disable-quic",
      "--no-first-run",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
    ],
  });
}

export const ARTIFACTS = "test-results";

/**
 * A fresh browser context (its own client address, so sign-in limits never interfere) signed in
 * through the real form as `email`, landed on `to` (default the home page).
 */
export async function signedInPage(browser: Browser, email: string, options: { to?: string; width?: number; height?: number } = {}): Promise<Page> {
  const to = options.to ?? "/";
  const context = await browser.newContext({ extraHTTPHeaders: { "x-forwarded-for": newAddress() }, viewport: { width: options.width ?? 1280, height: options.height ?? 900 } });
  const page = await context.newPage();
  await page.goto(to === "/" ? `${baseUrl()}/login` : `${baseUrl()}/login?redirectTo=${encodeURIComponent(to)}`);
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(DEMO_PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL(baseUrl() + to);
  return page;
}
