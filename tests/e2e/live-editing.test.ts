// Three people in one mechanism: owner and editor type at once and see each other's text and
// cursor; a viewer sees the graph gain a node when a new complex is typed, and cannot type. The
// completion list keeps the chosen name in sight.
import type { Page } from "playwright-core";
import { expect, it } from "vitest";
import { signedInPage, useServerAndBrowser } from "../support/e2e";
import { generatedOxidation } from "../fixtures/generated-oxidation";
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
  // Each editor sees the other's caret, named.
  await expect.poll(() => ownerPage.locator(".cm-mwPeerCaret[data-peer='Eli Editor']").count(), patience).toBe(1);
  await expect.poll(() => editorPage.locator(".cm-mwPeerCaret[data-peer='Ana Owner']").count(), patience).toBe(1);

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

/** Pastes `text` into the focused editor as the browser's clipboard would. */
function paste(page: Page, text: string) {
  return page.locator(".cm-content").evaluate((content, pasted) => {
    const data = new DataTransfer();
    data.setData("text/plain", pasted);
    content.dispatchEvent(new ClipboardEvent("paste", { clipboardData: data, bubbles: true, cancelable: true }));
  }, text);
}

it("refuses a paste over 1 MiB at once with the reason, strips NUL, and keeps everything typed afterwards", { timeout: 180_000 }, async () => {
  const owner = await signUp(world.server.url, "Paula Paster");
  const { id } = await (await owner.json("/api/v1/mechanisms", "POST", { title: "Big paste", source: "A -> B @ 1\n" })).json();
  const page = await signedInPage(world, owner.email);
  await page.goto(`${world.server.url}/m/${id}`);
  await page.waitForSelector("[data-testid=room-status][data-status=online]", patience);
  await page.click(".cm-content");
  await page.keyboard.press("Control+End");

  await paste(page, `# ${"x".repeat(1024 * 1024)}\n`);
  await expect.poll(() => page.locator("[data-testid=editor-notice]").innerText(), patience).toContain("the text would be over 1 MiB");
  expect(await editorText(page)).not.toContain("xxxx");
  expect(await page.locator("[data-testid=room-status]").getAttribute("data-status")).toBe("online");

  await page.keyboard.type("B -> C @ 2\n");
  await paste(page, "C\u0000 -> D @ 3\n");
  await expect.poll(() => page.locator("[data-testid=editor-notice]").innerText(), patience).toContain("NUL characters were removed");
  await expect.poll(() => editorText(page), patience).toContain("C -> D @ 3");

  // What was typed after the refusal is stored: a reload shows it.
  const stored = async () => ((await (await owner.get(`/api/v1/mechanisms/${id}`)).json()) as { source: string }).source;
  await expect.poll(stored, patience).toBe("A -> B @ 1\nB -> C @ 2\nC -> D @ 3\n");
  await page.reload();
  await page.waitForSelector("[data-testid=room-status][data-status=online]", patience);
  await expect.poll(() => editorText(page), patience).toContain("C -> D @ 3");
  expect(await editorText(page)).toContain("B -> C @ 2");
});

it("tells an editor whose paste the server refused, resyncs their copy, and keeps what they type next", { timeout: 180_000 }, async () => {
  const [owner, editor] = await Promise.all([signUp(world.server.url, "Olga Owner"), signUp(world.server.url, "Ezra Editor")]);
  const { id } = await (await owner.json("/api/v1/mechanisms", "POST", { title: "Two pastes", source: "A -> B @ 1\n" })).json();
  await owner.post(`/m/${id}/members`, { intent: "add", email: editor.email, role: "editor" });
  const pages = await Promise.all([owner, editor].map((account) => signedInPage(world, account.email)));
  for (const page of pages) {
    await page.goto(`${world.server.url}/m/${id}`);
    await page.waitForSelector("[data-testid=room-status][data-status=online]", patience);
    await page.click(".cm-content");
    await page.keyboard.press("Control+End");
  }

  // Each paste fits on its own; together they would take the text over 1 MiB. Pasted at once, each
  // passes its own editor's check and the server refuses the second to arrive (or, if one paste
  // reaches the other browser first, that editor refuses it locally): either way one is told why.
  await Promise.all(pages.map((page, index) => paste(page, `# ${"ab"[index].repeat(600 * 1024)}\n`)));
  const notices = () => Promise.all(pages.map((page) => page.locator("[data-testid=editor-notice]").count()));
  await expect.poll(async () => (await notices()).reduce((a, b) => a + b), patience).toBe(1);
  const refused = pages[(await notices()).indexOf(1)];
  expect(await refused.locator("[data-testid=editor-notice]").innerText()).toContain("the text would be over 1 MiB");
  await expect.poll(() => refused.locator("[data-testid=room-status]").getAttribute("data-status"), patience).toBe("online");

  await refused.click(".cm-content");
  await refused.keyboard.press("Control+Home");
  await refused.keyboard.type("# typed after the refusal\n");
  const stored = async () => ((await (await owner.get(`/api/v1/mechanisms/${id}`)).json()) as { source: string }).source;
  await expect.poll(async () => (await stored()).startsWith("# typed after the refusal\nA -> B @ 1\n"), patience).toBe(true);
  const source = await stored();
  expect(source.length).toBeGreaterThan(600 * 1024);
  expect(source.length).toBeLessThan(1024 * 1024);
});

it("keeps the chosen completion in sight as the arrow keys walk down a long list", { timeout: 180_000 }, async () => {
  const owner = await signUp(world.server.url, "Cora Completer");
  const { id } = await (await owner.json("/api/v1/mechanisms", "POST", { title: "Many names", source: generatedOxidation(120) })).json();
  const page = await signedInPage(world, owner.email);
  await page.goto(`${world.server.url}/m/${id}`);
  await page.waitForSelector("[data-testid=room-status][data-status=online]", patience);
  // The stored text has reached the editor (its analysis comes with it): a sync arriving after the
  // keys would change the text under the open list and close it.
  await page.waitForSelector("[data-testid=live-summary]", patience);
  await page.click(".cm-content");
  await page.keyboard.press("Control+End");
  await page.keyboard.press("Enter");
  await page.keyboard.press("Control+Space");
  const options = page.locator(".cm-tooltip-autocomplete li[role=option]");
  await expect.poll(() => options.count(), patience).toBeGreaterThan(20);
  const chosen = page.locator(".cm-tooltip-autocomplete li[aria-selected]");
  const chosenIndex = async () => Number(/-(\d+)$/.exec((await chosen.getAttribute("id", { timeout: 1000 }).catch(() => null)) ?? "")?.[1] ?? -1);
  await expect.poll(chosenIndex, patience).toBe(0);
  // Far enough down that the list must scroll for the chosen name to be seen; each key once the
  // list has taken the one before.
  for (let index = 1; index <= 15; index++) {
    await page.keyboard.press("ArrowDown");
    await expect.poll(chosenIndex, patience).toBe(index);
  }
  const inSight = () =>
    page.locator(".cm-tooltip-autocomplete ul").evaluate((list) => {
      const box = list.getBoundingClientRect();
      const option = list.querySelector("[aria-selected]")!.getBoundingClientRect();
      return list.scrollTop > 0 && option.top >= box.top - 1 && option.bottom <= box.bottom + 1;
    });
  await expect.poll(inSight, patience).toBe(true);
});
