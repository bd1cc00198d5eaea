// The Dynamics panel's overrides and sweep targets in the real browser: an override travels with
// every run, a sweep's range starts from the varied quantity's value, and a held species can be swept.
import { expect, it } from "vitest";
import { signedInPage, useServerAndBrowser } from "../support/e2e";
import { signUp } from "../support/http";

const world = useServerAndBrowser();

it("runs a simulation with an override and sweeps a held species", { timeout: 120_000 }, async () => {
  const owner = await signUp(world.server.url, "Olga Override");
  const source = ["r1: A -> B @ 1e3 * exp(-3000 / T)", "r2: B + F -> C @ 2", "T = 500", "fixed [F] = 1", "[A]0 = 1"].join("\n") + "\n";
  const { id } = await (await owner.json("/api/v1/mechanisms", "POST", { title: "Hot scheme", source })).json();
  const page = await signedInPage(world, owner.email);
  page.setDefaultTimeout(15_000);
  await page.goto(`${world.server.url}/m/${id}`);
  await page.waitForSelector("[data-testid=room-status][data-status=online]");
  await page.click('role=tab[name="Dynamics"]');

  await page.fill("[aria-label='New override']", "T=-1");
  await page.click("[data-testid=overrides] button:text-is('Add')");
  await page.waitForSelector("[data-testid=overrides] >> text=the value must be a number ≥ 0");
  await page.fill("[aria-label='New override']", "T=700");
  await page.click("[data-testid=overrides] button:text-is('Add')");
  await page.waitForSelector("[data-testid=overrides] li >> text=T=700");

  const bodies: string[] = [];
  page.on("request", (request) => {
    if (request.url().endsWith(`/api/v1/mechanisms/${id}/dynamics`)) bodies.push(request.postData() ?? "");
  });
  await page.click("button:text-is('Simulate')");
  await page.waitForSelector(".uplot canvas");
  expect(JSON.parse(bodies[0]).overrides).toEqual({ parameters: { T: 700 }, initial: {} });

  // The sweep starts on the parameter, a temperature, a quarter either side of its value in the
  // text (any other quantity a decade either side); a typed range holds for the quantity it was
  // typed for.
  const sweepCard = page.locator("[data-testid=sweep]");
  await page.focus("input[list=sweep-targets]");
  expect(await page.inputValue("input[list=sweep-targets]")).toBe("parameter:T");
  expect([await sweepCard.getByLabel("From").inputValue(), await sweepCard.getByLabel("To").inputValue()]).toEqual(["375", "625"]);
  await sweepCard.getByLabel("To").fill("900");
  await page.fill("input[list=sweep-targets]", "fixed:F");
  expect([await sweepCard.getByLabel("From").inputValue(), await sweepCard.getByLabel("To").inputValue()]).toEqual(["0.1", "10"]);
  await page.fill("input[list=sweep-targets]", "parameter:T");
  expect(await sweepCard.getByLabel("To").inputValue()).toBe("900");
  await page.fill("input[list=sweep-targets]", "fixed:F");
  await page.click("button:text-is('Sweep')");
  await page.waitForFunction(() => document.querySelectorAll(".uplot canvas").length >= 2);
  expect(JSON.parse(bodies[1]).options.target).toEqual({ kind: "fixed", species: "F" });

  // The sweep's hover label names the swept quantity.
  const sweep = page.locator("[data-testid=time-course-chart]").nth(1);
  await sweep.scrollIntoViewIfNeeded();
  const box = (await sweep.locator(".u-over").boundingBox())!;
  await page.mouse.move(box.x + box.width / 3, box.y + box.height / 2);
  await page.mouse.move(box.x + box.width / 2, box.y + box.height / 2);
  await expect.poll(() => page.locator("[data-testid=chart-legend]").nth(1).innerText()).toMatch(/\[F\] = \d/);
});
