// Three people in one mechanism: owner and editor type at once and see each other's text and
// cursor; a viewer sees the graph gain a node when a new complex is typed, and cannot type.
import type { Page } from "playwright-core";
import { expect, it } from "vitest";
import { signedInPage, useServerAndBrowser } from "../support/e2e";
import { signUp } from "../support/http";

const world = useServerAndBrowser();
/** Every wait is on a condition; these bounds only end a test that is truly stuck on a busy machine. */
const patience = { timeout: 30_000 };

const editorText = (page: Page) => page.locator(".cm-content").innerText();
const nodeCount = (page: Page) => page.locator(".react-flow__node").count();

it("co-edits live and shows the viewer a growing graph", { timeout: 180_000 }, async () => {
  const [owner, editor, viewer] = await Promise.all([signUp(world.server.url, "Ana Owner"), signUp(world.server.url, "Eli Editor"), signUp(world.server.url, "Vic Viewer")]);
  const { id } = await (await owner.json("/api/v1/mechanisms", "POST", { title: "Live scheme", source: "A + B -> C @ 1\n" })).json();
  await owner.post(`/m/${id}/members`, { intent: "add", email: editor.email, role: "editor" });
  await owner.post(`/m/${id}/members`, { intent: "add", email: viewer.email, role: "viewer" });

  const pages = await Promise.all([owner, editor, viewer].map((account) => signedInPage(world, account.email)));
  const [ownerPage, editorPage, viewerPage] = pages;
  await Promise.all(pages.map((page) => page.goto(`${world.server.url}/m/${id}`)));
  for (const page of pages) await page.waitForSelector('[data-testid=room-status][data-status=online]', patience);
  await expect.poll(() => nodeCount(viewerPage), patience).toBe(2);

  // Both type at once, at the end of different lines.
  await ownerPage.click(".cm-content");
  await ownerPage.keyboard.press("Control+End");
  await editorPage.click(".cm-content");
  await editorPage.keyboard.press("Control+Home");
  await Promise.all([ownerPage.keyboard.type("C -> D @ 2\n", { delay: 15 }), editorPage.keyboard.type("# draft by Eli\n", { delay: 15 })]);

  for (const page of [ownerPage, editorPage, viewerPage]) {
    await expect.poll(() => editorText(page), patience).toContain("C -> D @ 2");
    await expect.poll(() => editorText(page), patience).toContain("# draft by Eli");
  }
  // Each editor sees the other's named cursor.
  await expect.poll(() => ownerPage.locator(".cm-ySelectionInfo").allInnerTexts(), patience).toContain("Eli Editor");
  await expect.poll(() => editorPage.locator(".cm-ySelectionInfo").allInnerTexts(), patience).toContain("Ana Owner");

  // A new complex appears in the viewer's graph from the server's recompute.
  await expect.poll(() => nodeCount(viewerPage), patience).toBe(3);

  // The viewer cannot type.
  expect(await viewerPage.locator(".cm-content").getAttribute("contenteditable")).toBe("false");
  await viewerPage.click(".cm-content");
  await viewerPage.keyboard.type("X -> Y\n");
  // A read-only editor changes nothing locally, so it has nothing to send; a later edit of the
  // owner reaching the viewer shows the room has moved on without the viewer's keys.
  await ownerPage.keyboard.type("# seen by all\n");
  await expect.poll(() => editorText(viewerPage), patience).toContain("# seen by all");
  expect(await editorText(ownerPage)).not.toContain("X -> Y");
  expect(await editorText(viewerPage)).not.toContain("X -> Y");
});
