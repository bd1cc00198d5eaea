// What every end-to-end test file needs: a server of its own and Debian's Chromium, started
// before the tests and stopped after, and a page signed in as a given account.
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll } from "vitest";
import { launchBrowser } from "./browser";
import { startTestServer } from "./server";

export interface E2eWorld {
  server: Awaited<ReturnType<typeof startTestServer>>;
  browser: Browser;
}

/** Call at the top of a test file; the fields are filled in before the first test runs. */
export function useServerAndBrowser(): E2eWorld {
  const world = {} as E2eWorld;
  beforeAll(async () => {
    [world.server, world.browser] = await Promise.all([startTestServer(), launchBrowser()]);
  });
  afterAll(async () => {
    await world.browser?.close();
    await world.server?.dispose();
  });
  return world;
}

export async function signedInPage(world: E2eWorld, email: string, password = "correct horse battery"): Promise<Page> {
  const page = await (await world.browser.newContext({ viewport: { width: 1400, height: 900 } })).newPage();
  await page.goto(`${world.server.url}/sign-in`);
  await page.fill("#email", email);
  await page.fill("#password", password);
  await page.click("button[type=submit]");
  await page.waitForURL("**/dashboard");
  return page;
}
