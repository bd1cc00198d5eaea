// Every page under the Content-Security-Policy, in the real browser: the editor, the graph,
// KaTeX, the charts, the fonts and the WebSocket to /collab all work and nothing is refused.
// Signing out is a form post from the header.
import type { Page } from "playwright-core";
import { expect, it } from "vitest";
import { signedInPage, useServerAndBrowser } from "../support/e2e";
import { linkIn, signUp, waitForMail } from "../support/http";

const world = useServerAndBrowser();

/** Chromium logs each refusal as a console error; the event also names the directive. */
function watchPolicy(page: Page): string[] {
  const refusals: string[] = [];
  page.on("console", (message) => {
    if (message.type() === "error" && /Content Security Policy|Refused to/i.test(message.text())) refusals.push(`${page.url()}: ${message.text()}`);
  });
  void page.addInitScript(() =>
    document.addEventListener("securitypolicyviolation", (event) => console.error(`Refused to load: ${event.violatedDirective} ${event.blockedURI}`)),
  );
  return refusals;
}

async function visit(page: Page, path: string, ready: string) {
  await page.goto(world.server.url + path);
  await page.waitForSelector(ready, { timeout: 15_000 });
}

it("shows every page with no CSP refusal, and signs out with a POST", async () => {
  const owner = await signUp(world.server.url, "Cora Policy");
  const { id } = await (await owner.json("/api/v1/mechanisms", "POST", { title: "Policy scheme", source: "A + B -> C @ 1\nC <=> 2A @ 1, 2\n" })).json();
  const { url: viewLink } = await (await owner.json(`/api/v1/mechanisms/${id}/view-links`, "POST", {})).json();
  await owner.json(`/api/v1/mechanisms/${id}/invitations`, "POST", { email: "ivy.invitee@example.test", role: "viewer" });

  const page = await signedInPage(world, owner.email);
  const refusals = watchPolicy(page);
  page.setDefaultTimeout(15_000);
  await page.reload();

  await visit(page, `/m/${id}`, "[data-testid=room-status][data-status=online]");
  await page.waitForSelector(".react-flow__node");
  await page.waitForSelector(".cm-content");
  await page.click('role=tab[name="Structure"]');
  await page.waitForSelector(".katex");
  await page.click('role=tab[name="Dynamics"]');
  await page.click("button:text-is('Simulate')");
  await page.waitForSelector(".uplot canvas");
  await page.click('role=tab[name="Files & settings"]');
  await page.waitForSelector("text=Download");
  // The bundled fonts load from this site.
  expect(await page.evaluate(async () => (await document.fonts.ready, [...document.fonts].some((font) => font.status === "loaded")))).toBe(true);

  for (const [path, ready] of [
    ["/dashboard", "text=Policy scheme"],
    [`/m/${id}/members`, "#email"],
    [`/m/${id}/history`, "main"],
    [`/m/${id}/projector`, ".react-flow__node"],
    ["/settings/tokens", "main"],
    ["/realize", "main"],
    ["/api", "main"],
    ["/dev/mail", "main"],
  ]) {
    await visit(page, path, ready);
  }

  await page.click("button:text-is('Sign out')");
  await page.waitForURL(`${world.server.url}/`);
  await page.waitForSelector("text=Sign in");

  const guest = await (await world.browser.newContext({ viewport: { width: 1400, height: 900 } })).newPage();
  const guestRefusals = watchPolicy(guest);
  for (const [path, ready] of [
    ["/", "main"],
    ["/sign-in", "#email"],
    ["/sign-up", "#email"],
    [new URL(viewLink).pathname, "[data-testid=room-status][data-status=online]"],
  ]) {
    await visit(guest, path, ready);
  }
  const invitation = linkIn(await waitForMail(world.server.url, "ivy.invitee@example.test", "invited"), "/invite/");
  await visit(guest, invitation.pathname, "main");

  expect([...refusals, ...guestRefusals]).toEqual([]);

  // The watch does see a refusal: an inline script without the page's nonce.
  await guest.evaluate(() => document.body.append(Object.assign(document.createElement("script"), { textContent: "window.injected = 1" })));
  await expect.poll(() => guestRefusals.length).toBeGreaterThan(0);
  expect(await guest.evaluate(() => "injected" in window)).toBe(false);
}, 120_000);
