// The whole ODE-to-mechanism path in the browser: type an ODE, see its negative cross effect,
// apply the suggested translation and the product multiplier, open the realization as a new
// mechanism, and see its graph and structure.
import { expect, it } from "vitest";
import { signedInPage, useServerAndBrowser } from "../support/e2e";
import { signUp } from "../support/http";

const world = useServerAndBrowser();

it("turns the Lorenz system into a mechanism and opens it", async () => {
  const account = await signUp(world.server.url, "Rita Realizer");
  const page = await signedInPage(world, account.email);

  await page.goto(`${world.server.url}/realize`);
  await page.click("text=Check and realize");
  // Lorenz: -x*z in y' is the one negative cross effect (Hárs and Tóth's condition fails).
  await expect.poll(() => page.locator("text=Not kinetic").count(), { timeout: 20_000 }).toBeGreaterThan(0);
  expect(await page.locator("li", { hasText: "in y" }).innerText()).toContain("x*z");

  // The smallest multiplier is the one for the shifted ODE, where every equation has a cross effect.
  expect(await page.locator("[role=radiogroup]").innerText()).toContain("x*y*z — the smallest that removes every negative cross effect after the suggested translation");
  await page.check("text=Translate x → x + s");
  await page.check("text=the product of all variables");
  await page.click("button:text-is('Apply')");
  await expect.poll(() => page.locator("text=Open as a new mechanism").count(), { timeout: 30_000 }).toBeGreaterThan(0);
  // The multiplied mechanism runs on its own clock, with an end time to match.
  expect(await page.locator("[data-testid=realization-clock]").innerText()).toMatch(/dt = x\*y\*z · ds\), simulate this mechanism until s = 0\.00\d+/);
  // Side by side: the original and the realization, mapped back, on one chart.
  await page.locator("[data-testid=realization-check] button", { hasText: "Compare" }).click();
  await expect.poll(() => page.locator("[data-testid=realization-check] [data-testid=time-course-chart] canvas").count(), { timeout: 30_000 }).toBeGreaterThan(0);
  await page.screenshot({ path: "test-results/realization-check.png", fullPage: true });

  await page.fill("#new-title", "Lorenz, realized");
  await page.locator("button", { hasText: "Open as a new mechanism" }).first().click();
  await page.waitForURL(/\/m\/[a-z0-9]+$/, { timeout: 20_000 });
  await expect.poll(() => page.textContent("[data-testid=mechanism-title]")).toBe("Lorenz, realized");
  await expect.poll(() => page.locator(".react-flow__node").count(), { timeout: 20_000 }).toBeGreaterThan(3);
  await page.click('role=tab[name="Structure"]');
  await expect.poll(() => page.locator("section[aria-label=Structure]").innerText(), { timeout: 10_000 }).toContain("deficiency");
});
