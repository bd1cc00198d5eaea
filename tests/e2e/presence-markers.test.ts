// Co-authors' presence in the text: a co-author's name flag sits beside the line, never over
// what they just typed, fades to their caret alone when they stop, and returns when they go on.
import type { Page } from "playwright-core";
import { expect, it } from "vitest";
import { signedInPage, useServerAndBrowser } from "../support/e2e";
import { signUp } from "../support/http";

const world = useServerAndBrowser();
/** Bounds for a busy machine; every wait is on a condition. */
const patience = { timeout: 60_000 };

interface Box {
  left: number;
  top: number;
  right: number;
  bottom: number;
}

/** The box the given text takes on screen in the editor, within one line (highlighting splits it into several text nodes). */
function textBox(page: Page, text: string): Promise<Box | null> {
  return page.evaluate((wanted) => {
    for (const line of document.querySelectorAll(".cm-line")) {
      const at = line.textContent!.indexOf(wanted);
      if (at < 0) continue;
      const range = document.createRange();
      const walker = document.createTreeWalker(line, NodeFilter.SHOW_TEXT);
      let passed = 0;
      for (let node = walker.nextNode(); node; node = walker.nextNode()) {
        const length = node.textContent!.length;
        if (passed <= at && at < passed + length) range.setStart(node, at - passed);
        if (passed < at + wanted.length && at + wanted.length <= passed + length) range.setEnd(node, at + wanted.length - passed);
        passed += length;
      }
      const { left, top, right, bottom } = range.getBoundingClientRect();
      return { left, top, right, bottom };
    }
    return null;
  }, text);
}

const overlaps = (a: Box, b: Box) => a.left < b.right && b.left < a.right && a.top < b.bottom && b.top < a.bottom;

it("shows a co-author's flag beside the text they type, fading when they stop", { timeout: 240_000 }, async () => {
  const [owner, editor] = await Promise.all([signUp(world.server.url, "Ana Owner"), signUp(world.server.url, "Eli Editor")]);
  const { id } = await (await owner.json("/api/v1/mechanisms", "POST", { title: "Flags", source: "A + B -> C @ 1\nC -> D @ 2\n" })).json();
  await owner.post(`/m/${id}/members`, { intent: "add", email: editor.email, role: "editor" });
  const [ownerPage, editorPage] = await Promise.all([signedInPage(world, owner.email), signedInPage(world, editor.email)]);
  await Promise.all([ownerPage, editorPage].map((page) => page.goto(`${world.server.url}/m/${id}`)));
  for (const page of [ownerPage, editorPage]) await page.waitForSelector("[data-testid=room-status][data-status=online]", patience);

  // Eli types at the start of the second line, so the text sits where a label above or at the caret would fall.
  await editorPage.click(".cm-content");
  await editorPage.keyboard.press("Control+Home");
  await editorPage.keyboard.press("ArrowDown");
  const typed = "E + F -> G @ 3 # by Eli";
  await editorPage.keyboard.type(typed, { delay: 20 });
  // Enter must break the line, not pick a completion the last word may have opened.
  await editorPage.keyboard.press("Escape");
  await editorPage.keyboard.press("Enter");
  await editorPage.keyboard.press("ArrowUp");
  await editorPage.keyboard.press("End");

  const flag = ownerPage.locator(".cm-mwPeerFlag[data-peer='Eli Editor']");
  await expect.poll(() => textBox(ownerPage, typed), patience).not.toBeNull();
  await expect.poll(() => flag.getAttribute("data-idle"), patience).toBe("false");
  expect(await flag.innerText()).toBe("EE");
  const flagBox = (await flag.boundingBox())!;
  const typedBox = (await textBox(ownerPage, typed))!;
  expect(overlaps({ left: flagBox.x, top: flagBox.y, right: flagBox.x + flagBox.width, bottom: flagBox.y + flagBox.height }, typedBox)).toBe(false);
  // The flag is on the line of the caret: it overlaps that line's height, to its left.
  expect(flagBox.y).toBeLessThan(typedBox.bottom);
  expect(flagBox.y + flagBox.height).toBeGreaterThan(typedBox.top);
  expect(flagBox.x + flagBox.width).toBeLessThanOrEqual(typedBox.left);
  // No marker of the caret covers the text either.
  for (const caret of await ownerPage.locator(".cm-mwPeerCaret").all()) {
    const box = (await caret.boundingBox())!;
    expect(box.width).toBeLessThanOrEqual(3);
  }

  // Eli stops: the flag fades, the caret stays; Eli moves on: the flag is back.
  await expect.poll(() => flag.getAttribute("data-idle"), patience).toBe("true");
  await expect.poll(() => flag.evaluate((element) => getComputedStyle(element).visibility), patience).toBe("hidden");
  expect(await ownerPage.locator(".cm-mwPeerCaret[data-peer='Eli Editor']").count()).toBe(1);
  await editorPage.keyboard.type(" more");
  await expect.poll(() => flag.getAttribute("data-idle"), patience).toBe("false");
});
