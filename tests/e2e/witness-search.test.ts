// The witness search from the Structure panel in the real browser: a viewer of two-site
// phosphorylation, whose analysis on every change finds no witness, runs the search as a job and
// reads the witness with each steady state's residual and the totals they share.
import { readFileSync } from "node:fs";
import { expect, it } from "vitest";
import { signedInPage, useServerAndBrowser } from "../support/e2e";
import { signUp } from "../support/http";

const world = useServerAndBrowser();

it("a viewer runs the witness search and reads a witness that checks out", { timeout: 120_000 }, async () => {
  const owner = await signUp(world.server.url, "Wren Witness");
  const viewer = await signUp(world.server.url, "Vic Viewer");
  const source = readFileSync("tests/fixtures/two-site-phosphorylation.weave", "utf8");
  const { id } = await (await owner.json("/api/v1/mechanisms", "POST", { title: "Two-site phosphorylation", source })).json();
  await owner.post(`/m/${id}/members`, { intent: "add", email: viewer.email, role: "viewer" });
  const page = await signedInPage(world, viewer.email);
  page.setDefaultTimeout(60_000);
  await page.goto(`${world.server.url}/m/${id}`);
  await page.waitForSelector("[data-testid=room-status][data-status=online]");
  await page.click('role=tab[name="Structure"]');

  await expect.poll(() => page.locator("[data-testid=multistationarity-reason]").innerText()).toMatch(/witness search takes longer/);
  const search = page.locator("[data-testid=witness-search]");
  await search.locator("button:text-is('Run the witness search')").click();
  const result = search.locator("[data-testid=witness-result]");
  await result.waitFor();
  expect(await result.innerText()).toMatch(/Found: \d distinct positive steady states in one class/);
  expect(await result.locator("li").count()).toBeGreaterThanOrEqual(2);
  expect(await result.locator("li").first().innerText()).toMatch(/residual/);
  expect(await result.locator("[data-testid=witness-totals]").innerText()).toMatch(/steady states share the conservation-law totals/);
  if (process.env.SCREENSHOT_DIR) await page.locator("[data-testid=behaviour-verdicts]").screenshot({ path: `${process.env.SCREENSHOT_DIR}/witness-search.png` });
});
