// The whole ODE-to-mechanism path in the browser: type an ODE, see its negative cross effect,
// apply the suggested translation and the product multiplier, open the realization as a new
// mechanism, and see its graph and structure.
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, expect, it } from "vitest";
import { launchBrowser } from "../support/browser";
import { signUp } from "../support/http";
import { startTestServer } from "../support/server";

let server: Awaited<ReturnType<typeof startTestServer>>;
let browser: Browser;
beforeAll(async () => {
  [server, browser] = await Promise.all([startTestServer(), launchBrowser()]);
});
afterAll(async () => {
  await browser?.close();
  await server?.dispose();
});

it("turns the Lorenz system into a mechanism and opens it", async () => {
  const account = await signUp(server.url, "Rita Realizer");
  const page = await (await browser.newContext({ viewport: { width: 1400, height: 1000 } })).newPage();
  await page.goto(`${server.url}/sign-in`);
  await page.fill("#email", account.email);
  await page.fill("#password", "correct horse battery");
  await page.click("button[type=submit]");
  await page.waitForURL("**/dashboard");

  await page.goto(`${server.url}/realize`);
  await page.click("text=Check and realize");
  // Lorenz: -x*z in y' is the one negative cross effect (Hárs and Tóth's condition fails).
  await expect.poll(() => page.locator("text=Not kinetic").count(), { timeout: 20_000 }).toBeGreaterThan(0);
  expect(await page.locator("li", { hasText: "in y" }).innerText()).toContain("x*z");

  await page.check("text=Translate x → x + s");
  await page.check("text=the product of all variables");
  await page.click("button:text-is('Apply')");
  await expect.poll(() => page.locator("text=Open as a new mechanism").count(), { timeout: 30_000 }).toBeGreaterThan(0);
  await page.fill("#new-title", "Lorenz, realized");
  await page.locator("button", { hasText: "Open as a new mechanism" }).first().click();
  await page.waitForURL(/\/m\/[a-z0-9]+$/, { timeout: 20_000 });
  await expect.poll(() => page.textContent("[data-testid=mechanism-title]")).toBe("Lorenz, realized");
  await expect.poll(() => page.locator(".react-flow__node").count(), { timeout: 20_000 }).toBeGreaterThan(3);
  await page.click('role=tab[name="Structure"]');
  await expect.poll(() => page.locator("section[aria-label=Structure]").innerText(), { timeout: 10_000 }).toContain("deficiency");
});
