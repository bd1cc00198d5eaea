// The bifurcation diagram in the real browser: Schlögl's model followed in a parameter shows its
// S-shaped branch with the unstable middle dashed and both folds marked.
import { expect, it } from "vitest";
import { readFileSync } from "node:fs";
import { signedInPage, useServerAndBrowser } from "../support/e2e";
import { signUp } from "../support/http";

const world = useServerAndBrowser();

it("follows Schlögl's equilibria and marks both folds", { timeout: 120_000 }, async () => {
  const owner = await signUp(world.server.url, "Bea Branch");
  const source = readFileSync("tests/fixtures/dynamics/schloegl.weave", "utf8");
  const { id } = await (await owner.json("/api/v1/mechanisms", "POST", { title: "Schlögl", source })).json();
  const page = await signedInPage(world, owner.email);
  page.setDefaultTimeout(30_000);
  await page.goto(`${world.server.url}/m/${id}`);
  await page.waitForSelector("[data-testid=room-status][data-status=online]");
  await page.click('role=tab[name="Dynamics"]');

  const card = page.locator("[data-testid=continuation]");
  await card.locator("input[list=continuation-targets]").fill("parameter:k4");
  // The range starts a decade either side of the parameter's value (k4 = 5), not at a fixed 0.5 … 5.
  expect(Number(await card.locator("label:has-text('From') input").inputValue())).toBe(0.5);
  expect(Number(await card.locator("label:has-text('To') input").inputValue())).toBe(50);
  await card.locator("input[list=continuation-targets]").fill("fixed:A");
  expect(Number(await card.locator("label:has-text('To') input").inputValue())).toBe(60);
  await card.locator("input[list=continuation-targets]").fill("parameter:k4");
  await card.locator("label:has-text('From') input").fill("5");
  await card.locator("label:has-text('To') input").fill("7");
  await card.locator("button:text-is('Follow')").click();
  await card.locator("[data-testid=bifurcation-diagram]").waitFor();

  expect(await card.locator("path[data-stable]").evaluateAll((paths) => paths.map((p) => p.getAttribute("stroke-dasharray")))).toEqual([null, "7 5", null]);
  await expect.poll(() => card.locator("[data-testid=bifurcation-marker]").count()).toBe(2);
  expect(await card.locator("[data-testid=bifurcation-list]").innerText()).toMatch(/F1 fold at k4 = 6\.3849[\s\S]*F2 fold at k4 = 5\.6151/);
  await expect.poll(() => card.getByRole("note").innerText()).toMatch(/does not replace experimental hazard assessment/);
});
