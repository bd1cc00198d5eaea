// A realistic 64-step mechanism (two-letter species, coefficients from 1e-3 to 1e17, micromolar
// starts) read in the browser: the typeset equations stay inside the page on a phone and on a
// desktop, and the chart's tick labels are distinct and readable at micromolar levels.
import { mkdirSync, readFileSync } from "node:fs";
import type { Page } from "playwright-core";
import { beforeAll, describe, expect, it } from "vitest";
import { signedInPage, useServerAndBrowser } from "../support/e2e";
import { signUp } from "../support/http";

const world = useServerAndBrowser();
const source = readFileSync("tests/fixtures/oxidation-cell.weave", "utf8");
const shots = process.env.SCREENSHOT_DIR ?? "test-results";
let email = "";
let mechanismId = "";

beforeAll(async () => {
  mkdirSync(shots, { recursive: true });
  const owner = await signUp(world.server.url, "Rosa Reader");
  email = owner.email;
  const created = await owner.json("/api/v1/mechanisms", "POST", { title: "Dye oxidation flow cell", source });
  expect(created.status).toBe(201);
  mechanismId = ((await created.json()) as { id: string }).id;
});

async function openTab(width: number, tab: string): Promise<Page> {
  const page = await signedInPage(world, email);
  await page.setViewportSize({ width, height: 900 });
  await page.goto(`${world.server.url}/m/${mechanismId}`);
  await page.click(`role=tab[name="${tab}"]`);
  return page;
}

/** How far the typeset equations reach past their panel and past the window (0 when inside). */
async function overflow(page: Page): Promise<{ panel: number; page: number }> {
  return page.evaluate(() => {
    const section = [...document.querySelectorAll("section[aria-label=Structure] section")].find((each) =>
      each.querySelector("h3")?.textContent?.includes("differential equations"),
    )!;
    const panel = section.getBoundingClientRect();
    // What is drawn: KaTeX's MathML twin is clipped to nothing for screen readers.
    const formulas = [...section.querySelectorAll(".katex-html")];
    const right = Math.max(...formulas.map((each) => each.getBoundingClientRect().right));
    return { panel: Math.max(0, right - panel.right), page: Math.max(0, right - window.innerWidth) };
  });
}

describe.each([1280, 390])("at %i px wide", (width) => {
  it("keeps every typeset equation inside the page, concentrations in brackets", async () => {
    const page = await openTab(width, "Structure");
    await expect.poll(() => page.locator("section[aria-label=Structure] .katex").count(), { timeout: 120_000 }).toBeGreaterThanOrEqual(28);
    const { panel, page: window } = await overflow(page);
    // A pixel for sub-pixel rounding.
    expect(panel).toBeLessThanOrEqual(1);
    expect(window).toBeLessThanOrEqual(1);
    const equations = page.locator("section[aria-label=Structure] section", { hasText: "differential equations" });
    // [MQ] and [M][Q] read apart; 2 × 1.5e9 is written as one number.
    expect(await equations.locator(".katex-mathml").allTextContents()).toEqual(expect.arrayContaining([expect.stringContaining("[MQ]")]));
    expect(await equations.locator("[title*='k33 = 3.15×10¹⁶']").count()).toBeGreaterThan(0);
    // A wrapped equation continues indented under its start.
    const starts = await equations.locator("[title] .katex-html").first().evaluate((html) => {
      const lefts = new Map<number, number>();
      for (const base of html.children) {
        const { top, left } = base.getBoundingClientRect();
        lefts.set(Math.round(top / 10), Math.min(lefts.get(Math.round(top / 10)) ?? Infinity, left));
      }
      return [...lefts.values()];
    });
    expect(starts.length).toBeGreaterThan(1);
    expect(Math.min(...starts.slice(1))).toBeGreaterThan(starts[0] + 10);
    await equations.screenshot({ path: `${shots}/equations-${width}.png` });
  }, 240_000);
});

it("simulates and labels the axes with distinct ticks, linear and log", async () => {
  const page = await openTab(1280, "Dynamics");
  await page.fill("label:has-text('Until time') input", "0.002");
  await page.click("button:text-is('Simulate')");
  const chart = page.locator("[data-testid=time-course-chart]").first();
  await expect.poll(() => chart.getAttribute("data-y-ticks"), { timeout: 180_000 }).toBeTruthy();
  const ticks = async (axis: "x" | "y") => ((await chart.getAttribute(`data-${axis}-ticks`)) ?? "").split(" | ");

  const xs = await ticks("x");
  expect(new Set(xs).size).toBe(xs.length);
  expect(xs).toContain("0.001");
  const ys = await ticks("y");
  expect(new Set(ys).size).toBe(ys.length);
  // Micromolar values: a × 10^n, never a column of zeros.
  expect(ys.filter((label) => label !== "0").every((label) => /×10⁻|^10⁻/.test(label))).toBe(true);
  expect(await page.locator(".u-legend").count()).toBe(0);
  await page.locator("[data-testid=dynamics] section").first().screenshot({ path: `${shots}/chart-linear.png` });

  await page.locator("label", { hasText: "log concentration axis" }).locator("input").check();
  await expect.poll(async () => (await ticks("y")).every((label) => /^10⁻?[⁰¹²³⁴⁵⁶⁷⁸⁹]+$/.test(label)), { timeout: 10_000 }).toBe(true);
  const logYs = await ticks("y");
  expect(new Set(logYs).size).toBe(logYs.length);
  await page.locator("[data-testid=dynamics] section").first().screenshot({ path: `${shots}/chart-log.png` });

  // Hiding a species from our legend removes its line; the downloads carry the shown ones.
  await page.locator("[data-testid=chart-legend] label", { hasText: /^Dy/ }).click();
  const [svg] = await Promise.all([page.waitForEvent("download"), page.click("button:text-is('SVG')")]);
  const file = readFileSync((await svg.path())!, "utf8");
  expect(file).toMatch(/^<svg xmlns/);
  expect(file).not.toContain(">Dy</text>");
  expect(file).toContain(">MQ</text>");
  const [png] = await Promise.all([page.waitForEvent("download"), page.click("button:text-is('PNG')")]);
  expect(readFileSync((await png.path())!).subarray(1, 4).toString()).toBe("PNG");
}, 480_000);
