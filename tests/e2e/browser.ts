// Debian's Chromium driven by playwright-core (no browser download). launch() gives every
// browser a fresh temporary profile, so no --user-data-dir is passed.
import { chromium, type Browser } from "playwright-core";

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
