// Fitting together: two editors of a ten-species mechanism with three data sets open the Fit tab;
// one runs a fit in the browser and the other sees it appear without reloading; Apply changes the
// text in both editors at once and names the version, and Undo puts the old values back. Screenshots of the panel go to
// FIT_SHOTS_DIR when it is set (the report's pictures).
import { mkdirSync } from "node:fs";
import path from "node:path";
import type { Page } from "playwright-core";
import { expect, it } from "vitest";
import { cascadeCsv, cascadeSource } from "../fixtures/fit-room/cascade";
import { signedInPage, useServerAndBrowser } from "../support/e2e";
import { addMember, signUp } from "../support/http";

const world = useServerAndBrowser();
const patience = { timeout: 60_000 };
const shots = process.env.FIT_SHOTS_DIR;

const editorText = (page: Page) => page.locator(".cm-content").innerText();

async function shoot(page: Page, name: string) {
  if (!shots) return;
  mkdirSync(shots, { recursive: true });
  await page.locator("[data-testid=fit-panel]").screenshot({ path: path.join(shots, `${name}.png`) });
}

async function openFitTab(page: Page, url: string) {
  await page.goto(url);
  await page.waitForSelector("[data-testid=room-status][data-status=online]", patience);
  await page.getByRole("tab", { name: "Fit" }).click();
  await page.waitForSelector("[data-testid=fit-panel]", patience);
}

it("one editor's fit appears for the other, and applying it changes both editors' text and names the version", { timeout: 300_000 }, async () => {
  const owner = await signUp(world.server.url, "Oren Owner");
  const { id } = await (await owner.json("/api/v1/mechanisms", "POST", { title: "Oxidation cascade", source: cascadeSource })).json();
  const editor = await addMember(owner, id, "editor", "Edda Editor");
  for (const [name, s0, seed] of [["loading 0.5", 0.5, 11], ["loading 1.0", 1.0, 12], ["loading 2.0", 2.0, 13]] as const) {
    const stored = await owner.request(`/api/v1/mechanisms/${id}/data-sets?name=${encodeURIComponent(name)}`, { method: "POST", headers: { "Content-Type": "text/csv" }, body: cascadeCsv(s0, seed) });
    expect(stored.status).toBe(201);
  }

  const [ownerPage, editorPage] = await Promise.all([owner, editor].map((account) => signedInPage(world, account.email)));
  await Promise.all([ownerPage, editorPage].map((page) => openFitTab(page, `${world.server.url}/m/${id}`)));
  await expect.poll(() => ownerPage.locator("[data-testid=data-sets] li").count(), patience).toBe(3);

  // The owner chooses the three data sets and three coefficients, and runs the fit.
  for (const box of await ownerPage.locator("[data-testid=data-sets] input[type=checkbox]").all()) await box.check();
  for (const name of ["k_ox", "k2", "k3"]) await ownerPage.getByTestId(`vary-${name}`).check();
  await ownerPage.getByLabel("upper bound of k3").fill("10");
  await ownerPage.getByTestId("run-fit").click();

  // The editor, who did nothing, sees the finished fit appear.
  await expect.poll(() => editorPage.locator("[data-testid=fit-parameters] tbody tr").count(), patience).toBe(3);
  const estimate = async (page: Page, name: string) => Number((await page.locator("[data-testid=fit-parameters] tr", { hasText: name }).locator("td").nth(2).innerText()).replace(/\s/g, ""));
  await expect.poll(() => estimate(editorPage, "k_ox"), patience).toBeGreaterThan(0.7);
  expect(await estimate(editorPage, "k_ox")).toBeLessThan(0.9);
  expect(await estimate(editorPage, "k2")).toBeCloseTo(0.3, 1);
  expect(await estimate(editorPage, "k3")).toBeCloseTo(0.15, 1);
  await expect.poll(() => ownerPage.locator("[data-testid=fit-parameters] tbody tr").count(), patience).toBe(3);
  await ownerPage.locator("[data-testid=residual-plot] svg").waitFor(patience);
  await shoot(ownerPage, "fit-result");

  // Sensitivities and rates of production, for the pictures and to see that they draw.
  await ownerPage.getByTestId("run-sensitivities").click();
  await ownerPage.locator("[data-testid=sensitivity-heatmap]").waitFor(patience);
  await ownerPage.locator("[data-testid=rates-of-production] li").first().waitFor(patience);
  expect(await ownerPage.locator("[data-testid=sensitivity-heatmap] tbody tr").count()).toBe(10);
  await shoot(ownerPage, "fit-panel-full");

  // The editor applies it: both editors' text changes at once, and the version is named.
  await editorPage.getByTestId("apply-fit").click();
  await expect.poll(() => editorPage.getByTestId("apply-status").innerText(), patience).toContain("fitted to loading 0.5, loading 1.0 and loading 2.0");
  for (const page of [ownerPage, editorPage]) {
    await expect.poll(() => editorText(page), patience).not.toContain("k_ox = 0.4");
    expect(await editorText(page)).toMatch(/k_ox = 0\.[78]\d*/);
  }
  const { snapshots } = await (await owner.get(`/api/v1/mechanisms/${id}/snapshots`)).json();
  expect(snapshots[0]).toMatchObject({ kind: "named", name: "fitted to loading 0.5, loading 1.0 and loading 2.0", author: "Edda Editor" });
  await shoot(editorPage, "after-apply");

  // Undo puts the old values back in one edit, for everyone.
  await editorPage.getByTestId("undo-apply").click();
  for (const page of [ownerPage, editorPage]) await expect.poll(() => editorText(page), patience).toContain("k_ox = 0.4");
  expect(await editorText(ownerPage)).toContain("k3 = 0.05");
});
