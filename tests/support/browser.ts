// Debian's Chromium driven by playwright-core; never a downloaded browser. Playwright gives
// every launch a new empty profile folder of its own.
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
