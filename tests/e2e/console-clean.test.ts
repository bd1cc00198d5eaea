// Pages must hydrate without a mismatch: React reports one (error #418 in production) on the
// console, and then throws the server's HTML away. Any console error or uncaught error fails.
import type { Page } from "playwright-core";
import { expect, it } from "vitest";
import { signedInPage, useServerAndBrowser } from "../support/e2e";
import { signUp } from "../support/http";

const world = useServerAndBrowser();

/** Collects every console error and uncaught page error from now on. */
function watchErrors(page: Page): string[] {
  const errors: string[] = [];
  page.on("console", (message) => {
    if (message.type() === "error") errors.push(message.text());
  });
  page.on("pageerror", (error) => errors.push(error.message));
  return errors;
}

/** Loads a page and waits until React has hydrated its main element (it carries React's fiber then). */
async function loadAndHydrate(page: Page, url: string): Promise<void> {
  await page.goto(url, { waitUntil: "networkidle" });
  await page.waitForFunction(() => {
    const main = document.querySelector("main");
    return main !== null && Object.keys(main).some((key) => key.startsWith("__reactFiber"));
  });
}

it("the home page hydrates without console errors and states the deficiency the engine computes", async () => {
  const page = await (await world.browser.newContext()).newPage();
  const errors = watchErrors(page);
  await loadAndHydrate(page, `${world.server.url}/`);
  expect(await page.textContent("main pre")).toContain("4 complexes · 2 linkage classes · deficiency 0");
  expect(errors).toEqual([]);
});

it("the history page and every page that shows ages hydrate without console errors", async () => {
  const owner = await signUp(world.server.url, "Hana History");
  const created = await owner.json("/api/v1/mechanisms", "POST", { title: "Versions to compare", source: "A <=> B @ 1, 2\n" });
  expect(created.status).toBe(201);
  const { id } = (await created.json()) as { id: string };
  for (const name of ["first", "second"]) expect((await owner.json(`/api/v1/mechanisms/${id}/snapshots`, "POST", { name })).status).toBeLessThan(300);

  const page = await signedInPage(world, owner.email);
  // The reader's clock is rarely the server's: "just now" on the server must not become
  // "in 10 minutes" while the page hydrates.
  await page.clock.setSystemTime(Date.now() + 10 * 60_000);
  const errors = watchErrors(page);
  await loadAndHydrate(page, `${world.server.url}/m/${id}/history`);
  await page.waitForSelector("[data-testid=invariant-diff]");
  // Every other page that shows ages: the dashboard, the members page (invitations, view links,
  // the role history) and the tokens page.
  const invited = await owner.json(`/api/v1/mechanisms/${id}/invitations`, "POST", { email: "later@example.test", role: "viewer" });
  expect(invited.status).toBeLessThan(300);
  expect((await owner.json(`/api/v1/mechanisms/${id}/view-links`, "POST", {})).status).toBeLessThan(300);
  expect((await owner.json("/api/v1/tokens", "POST", { name: "script" })).status).toBeLessThan(300);
  for (const path of ["/dashboard", `/m/${id}/members`, "/settings/tokens"]) await loadAndHydrate(page, `${world.server.url}${path}`);
  expect(errors).toEqual([]);
});
