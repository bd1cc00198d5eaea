// The Dynamics panel's stochastic runs in the real browser: the card sends volume, runs and seed,
// and draws a band per species with the first runs; the caution stays above the panel.
import { mkdirSync } from "node:fs";
import { expect, it } from "vitest";
import { signedInPage, useServerAndBrowser } from "../support/e2e";
import { signUp } from "../support/http";

const world = useServerAndBrowser();
const shots = process.env.SCREENSHOT_DIR ?? "test-results";

/** A new owner's mechanism open on the Dynamics tab, its stochastic card and the mechanism's id. */
async function stochasticCard(ownerName: string, title: string, source: string) {
  const owner = await signUp(world.server.url, ownerName);
  const { id } = await (await owner.json("/api/v1/mechanisms", "POST", { title, source })).json();
  const page = await signedInPage(world, owner.email);
  page.setDefaultTimeout(60_000);
  await page.goto(`${world.server.url}/m/${id}`);
  await page.waitForSelector("[data-testid=room-status][data-status=online]");
  await page.click('role=tab[name="Dynamics"]');
  return { id: id as string, page, card: page.locator("[data-testid=stochastic]") };
}

it("runs an ensemble and draws mean ± sd bands with sample runs", { timeout: 180_000 }, async () => {
  mkdirSync(shots, { recursive: true });
  // An invented gene-expression toy: mRNA made and lost, protein made from it and lost.
  const source = ["transcribe: 0 -> M @ 2", "translate: M -> M + P @ 5", "lose_m: M -> 0 @ 0.5", "lose_p: P -> 0 @ 0.2", "[M]0 = 0", "[P]0 = 0"].join("\n") + "\n";
  const { id, page, card } = await stochasticCard("Stella Stochastic", "Bursty expression", source);
  await card.locator("label:has-text('Volume V') input").fill("2");
  await card.locator("label:has-text('Runs') input").fill("300");
  await card.locator("label:has-text('Seed') input").fill("7");
  await card.locator("label:has-text('Until time') input").fill("30");
  const bodies: string[] = [];
  page.on("request", (request) => {
    if (request.url().endsWith(`/api/v1/mechanisms/${id}/dynamics`)) bodies.push(request.postData() ?? "");
  });
  await card.locator("button:text-is('Run')").click();
  await card.locator("[data-testid=ensemble-chart] path").first().waitFor();
  expect(JSON.parse(bodies[0])).toMatchObject({ kind: "stochastic", settings: { volume: 2, runs: 300, seed: 7, until: 30 } });
  // Two species: a band, a mean and three runs each.
  await expect.poll(() => card.locator("[data-testid=ensemble-chart] path").count()).toBe(10);
  await expect.poll(() => card.innerText()).toMatch(/mean ± one standard deviation over 300 runs/);
  await expect.poll(() => page.locator("[data-testid=dynamics] [role=note]").innerText()).toMatch(/do not replace experimental hazard assessment/);
  await card.scrollIntoViewIfNeeded();
  await card.screenshot({ path: `${shots}/stochastic-card.png` });
  await page.screenshot({ path: `${shots}/stochastic-panel.png`, fullPage: true });
});

it("chooses the volume from the initial concentrations and shows the copies it implies", { timeout: 180_000 }, async () => {
  // An invented dilute solution: every species at 1e-4 mol/L or less.
  const source = ["bind: A + B -> C @ 1e6", "[A]0 = 1e-4", "[B]0 = 3e-4", "[C]0 = 0"].join("\n") + "\n";
  const { card } = await stochasticCard("Vera Volume", "Dilute binding", source);
  await card.locator("[data-testid=starting-copies]").waitFor();
  expect(Number(await card.locator("label:has-text('Volume V') input").inputValue())).toBe(5e6);
  expect(await card.locator("[data-testid=starting-copies]").innerText()).toMatch(/chosen from the initial concentrations, the runs start with A 500, B 1500\./);
  await card.locator("[data-testid=starting-copies]").scrollIntoViewIfNeeded();
  await card.screenshot({ path: `${shots}/stochastic-default-volume.png` });
  // A volume typed by the reader is kept, and what it implies is said.
  await card.locator("label:has-text('Volume V') input").fill("100");
  await expect.poll(() => card.locator("[data-testid=starting-copies]").innerText()).toMatch(/no molecules at all.*A, B round to 0 copies/);
});
