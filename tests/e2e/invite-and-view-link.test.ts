// The owner invites a new address; the e-mail arrives in the mail catcher; its link signs the
// invitee up, the seat waits until the mailed confirmation link is used, then they edit live. A
// view link opened in a fresh browser shows the live graph and cannot type.
import { expect, it } from "vitest";
import { signedInPage, useServerAndBrowser } from "../support/e2e";
import { linkIn, signUp, VERIFY_SUBJECT, waitForMail } from "../support/http";

const world = useServerAndBrowser();

it("invites a newcomer who edits live, and shows a class the live graph through a view link", { timeout: 180_000 }, async () => { // two mails and a confirmation before the invitee edits
  const owner = await signUp(world.server.url, "Owen Owner");
  const { id } = await (await owner.json("/api/v1/mechanisms", "POST", { title: "Seminar scheme", source: "A -> B @ 1\n" })).json();

  const ownerPage = await signedInPage(world, owner.email);
  await ownerPage.goto(`${world.server.url}/m/${id}/members`);
  await ownerPage.fill("#email", "nina.newcomer@example.test");
  await ownerPage.selectOption("#role", "editor");
  await ownerPage.click("button:text-is('Send invitation')");
  await ownerPage.waitForSelector('[data-testid="invitation-nina.newcomer@example.test"]');

  const link = linkIn(await waitForMail(world.server.url, "nina.newcomer@example.test", "Seminar scheme"), "/invite/").href;

  const invitee = await (await world.browser.newContext({ viewport: { width: 1400, height: 900 } })).newPage();
  await invitee.goto(link);
  await invitee.fill("#name", "Nina Newcomer");
  await invitee.fill("#password", "a fine long password");
  await invitee.click("button:text-is('Create account and join')");
  await invitee.waitForURL("**/verify-email");
  expect(await invitee.textContent("[data-testid=waiting-seats]")).toContain("Seminar scheme");
  const confirm = linkIn(await waitForMail(world.server.url, "nina.newcomer@example.test", VERIFY_SUBJECT), "/verify-email/").href;
  await invitee.goto(confirm);
  await invitee.click("button:text-is('Confirm my address')");
  await invitee.click("text=Seminar scheme");
  await invitee.waitForURL(`**/m/${id}`);
  await invitee.waitForSelector("[data-testid=room-status][data-status=online]");
  await invitee.click(".cm-content");
  await invitee.keyboard.press("Control+End");
  await invitee.keyboard.type("B -> C @ 2\n", { delay: 10 });

  await ownerPage.goto(`${world.server.url}/m/${id}`);
  await expect.poll(() => ownerPage.locator(".cm-content").innerText(), { timeout: 30_000 }).toContain("B -> C @ 2");

  // A view link for the class, opened by a browser that never signed in.
  await ownerPage.goto(`${world.server.url}/m/${id}/members`);
  await ownerPage.click("button:text-is('Create view link')");
  const viewUrl = await ownerPage.locator("[data-testid=new-view-link]").innerText();
  const guest = await (await world.browser.newContext({ viewport: { width: 1400, height: 900 } })).newPage();
  await guest.goto(viewUrl);
  await guest.waitForURL(`**/m/${id}`);
  await expect.poll(() => guest.locator(".react-flow__node").count(), { timeout: 30_000 }).toBe(3);
  expect(await guest.locator(".cm-content").getAttribute("contenteditable")).toBe("false");
  // It follows the edits live.
  await invitee.keyboard.type("C -> D @ 3\n", { delay: 10 });
  await expect.poll(() => guest.locator(".react-flow__node").count(), { timeout: 30_000 }).toBe(4);
  // And it opens nothing else.
  const members = await guest.goto(`${world.server.url}/m/${id}/members`);
  expect(guest.url()).toContain("/sign-in");
  expect(members?.status()).toBe(200);
});
