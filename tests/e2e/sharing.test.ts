// A person signs up, creates a mechanism, shares it with a viewer; the viewer sees it but
// cannot rename it — in the real browser against the real server.
import { expect, it } from "vitest";
import { signedInPage, useServerAndBrowser } from "../support/e2e";
import { signUp } from "../support/http";

const world = useServerAndBrowser();

it("signs up, creates and shares a mechanism; the viewer sees it and cannot rename it", async () => {
  const viewerAccount = await signUp(world.server.url, "Vera Viewer");

  const owner = await (await world.browser.newContext()).newPage();
  await owner.goto(`${world.server.url}/sign-up`);
  await owner.fill("#name", "Olu Owner");
  await owner.fill("#email", "olu.owner@example.test");
  await owner.fill("#password", "a long secret phrase");
  await owner.click("button[type=submit]");
  await owner.waitForURL("**/dashboard");
  await owner.fill("input[name=title]", "Ozone cycle draft");
  await owner.click("text=New mechanism");
  await owner.waitForURL(/\/m\/[a-z0-9]+$/);
  const mechanismUrl = owner.url();
  await expect.poll(() => owner.textContent("[data-testid=mechanism-title]")).toBe("Ozone cycle draft");

  await owner.click("text=Members");
  await owner.fill("#email", viewerAccount.email);
  await owner.selectOption("#role", "viewer");
  await owner.click("text=Add member");
  await owner.waitForSelector(`[data-testid="member-${viewerAccount.email}"]`);

  const viewer = await signedInPage(world, viewerAccount.email);
  await viewer.click("text=Ozone cycle draft");
  await viewer.waitForURL(mechanismUrl);
  // The dashboard's own title field must be gone before the check means anything.
  await viewer.waitForSelector("[data-testid=mechanism-title]");
  await viewer.click('role=tab[name="Files & settings"]');
  await viewer.waitForSelector("text=Download");
  expect(await viewer.locator("input[name=title]").count()).toBe(0);

  // Even a hand-made request from the viewer's browser is refused by the server.
  const status = await viewer.evaluate(async (url) => {
    const body = new URLSearchParams({ intent: "rename", title: "Renamed by viewer" });
    return (await fetch(url, { method: "POST", body })).status;
  }, mechanismUrl);
  expect(status).toBe(403);
  await viewer.reload();
  expect(await viewer.textContent("[data-testid=mechanism-title]")).toBe("Ozone cycle draft");
});
