// Typing stays fast at 500 steps: the same 40 keystrokes typed into the 3-step demo mechanism and
// into a generated 500-step one, in one run on one machine. Measured in the page: each keystroke's
// time from the key event to the frame painted after the text changed, and every long task
// (PerformanceObserver "longtask", a task of 50 ms or more) from the first keystroke until the
// room's analysis of the typed text has arrived. Loading the page is not asserted on; how long
// the graph takes to appear after navigation is printed.
import type { Page } from "playwright-core";
import { beforeAll, expect, it } from "vitest";
import { demoMechanisms } from "../../server/seed/demo";
import { generatedOxidation } from "../fixtures/generated-oxidation";
import { signedInPage, useServerAndBrowser } from "../support/e2e";
import { signUp } from "../support/http";
import { traceMainThread } from "../support/main-thread-trace";

const world = useServerAndBrowser();
/** Bounds for a machine shared with other test runs; every wait is on a condition. */
const patience = { timeout: 180_000 };
/** A new step, so the structure (and the graph) changes while it is typed: 40 keys with the Enter. */
const typed = "\nqq: AB + CD -> XY + ZZ @ 2.5e9 # typing";
const demo = demoMechanisms[0].source;
let owner: Awaited<ReturnType<typeof signUp>>;

beforeAll(async () => {
  owner = await signUp(world.server.url, "Tara Typist");
});

interface TypingCost {
  /** Key event to painted frame, ms, one per keystroke. */
  paints: number[];
  /** Durations of the long tasks seen while typing, ms. */
  longTasks: number[];
  /** From the start of navigation to the first drawn complex of the graph, ms. */
  graphShown: number;
  /** The page's main-thread tasks while typing, by CPU time, ms: what the page itself costs. */
  cpuTasks: number[];
}

/** Opens the mechanism, waits until its graph is drawn, and types `typed` at the end of the text. */
async function typingCost(source: string): Promise<TypingCost> {
  const created = await owner.json("/api/v1/mechanisms", "POST", { title: "Typing check", source });
  const { id } = (await created.json()) as { id: string };
  const page = await signedInPage(world, owner.email);
  await page.goto(`${world.server.url}/m/${id}`);
  await page.waitForSelector("[data-testid=room-status][data-status=online]", patience);
  await page.waitForSelector(".react-flow__node", patience);
  const graphShown = await page.evaluate(() => performance.now());
  await page.waitForSelector("[data-testid=live-summary]", patience);
  await page.click(".cm-content");
  await page.keyboard.press("Control+End");
  // The jump to the end redraws the editor's last screen over a few frames; that is not typing.
  await quiet(page, 500);
  const before = await revision(page);
  await instrument(page);
  const stopTrace = await traceMainThread(page);
  // About eight keys a second, a quick typist.
  await page.keyboard.type(typed, { delay: 120 });
  // The analysis of the last keystroke, and whatever the page does with it, belong to typing.
  await expect.poll(() => page.evaluate(() => document.querySelector(".cm-content")?.textContent?.includes("# typing")), patience).toBe(true);
  await expect.poll(async () => (await revision(page)) > before, patience).toBe(true);
  // Late work is counted too.
  await quiet(page, 1000);
  const { cpu } = await stopTrace();
  const cost = await page.evaluate(() => (window as unknown as { typingCost: Pick<TypingCost, "paints" | "longTasks"> }).typingCost);
  await page.context().close();
  return { ...cost, graphShown, cpuTasks: cpu };
}

/** The room's analysis revision, which the status badge carries in its title. */
async function revision(page: Page): Promise<number> {
  const title = (await page.getAttribute("[data-testid=room-status]", "title")) ?? "";
  return Number(/revision (\d+)/.exec(title)?.[1] ?? 0);
}

/** Starts recording in the page: key-to-paint per keystroke and long tasks. */
function instrument(page: Page) {
  return page.evaluate(() => {
    const cost = { paints: [] as number[], longTasks: [] as number[] };
    (window as unknown as { typingCost: typeof cost }).typingCost = cost;
    new PerformanceObserver((list) => {
      for (const entry of list.getEntries()) cost.longTasks.push(entry.duration);
    }).observe({ type: "longtask" });
    // The key event's own time stamp counts the wait for a busy main thread too.
    let pressed: number | null = null;
    document.addEventListener("keydown", (event) => (pressed = event.timeStamp), { capture: true });
    // The text changed: the frame after the next animation frame is the one that shows it.
    new MutationObserver(() => {
      if (pressed === null) return;
      const start = pressed;
      pressed = null;
      requestAnimationFrame(() => setTimeout(() => cost.paints.push(performance.now() - start)));
    }).observe(document.querySelector(".cm-content")!, { childList: true, subtree: true, characterData: true });
  });
}

/** Waits until the page has gone `ms` without a long task. */
function quiet(page: Page, ms: number) {
  return page.evaluate(
    (ms) =>
      new Promise<void>((resolve) => {
        let last = performance.now();
        const observer = new PerformanceObserver(() => (last = performance.now()));
        observer.observe({ type: "longtask" });
        const check = () => {
          if (performance.now() - last < ms) return void setTimeout(check, 50);
          observer.disconnect();
          resolve();
        };
        check();
      }),
    ms,
  );
}

const sum = (values: number[]) => values.reduce((total, value) => total + value, 0);
/** The five slowest keystrokes as "61 ms at 'X'". */
const slowest = (paints: number[]) =>
  paints
    .map((ms, index) => ({ ms, key: JSON.stringify(typed[index]) }))
    .sort((a, b) => b.ms - a.ms)
    .slice(0, 5)
    .map(({ ms, key }) => `${ms.toFixed(0)} ms at ${key}`)
    .join(", ");
const median = (values: number[]) => [...values].sort((a, b) => a - b)[Math.floor(values.length / 2)];
const p95 = (values: number[]) => [...values].sort((a, b) => a - b)[Math.ceil(values.length * 0.95) - 1];

// Runs with TYPING_BENCHMARK=1. The targets are on wall time, which this shared machine's load
// swells: tasks of 50–139 ms there were 10–30 ms of the main thread's CPU time, which is printed
// beside them (DEVELOPERS.md, Performance notes). So this is left out of the default suite, which
// must not fail on load.
it.runIf(process.env.TYPING_BENCHMARK === "1")("types as fast into 500 steps as into the 3-step demo, and no task blocks the page", { timeout: 900_000 }, async () => {
  const small = await typingCost(demo);
  const large = await typingCost(generatedOxidation(500));
  for (const cost of [small, large]) expect(cost.paints.length).toBe(typed.length);
  const ratio = p95(large.paints) / p95(small.paints);
  // The target is the 500-step page's; the demo's own longest task is printed beside it.
  const longest = Math.max(0, ...large.longTasks);
  const demoLongest = Math.max(0, ...small.longTasks);
  console.log(
    `typing: key-to-paint p95 ${p95(small.paints).toFixed(0)} ms (3 steps), ${p95(large.paints).toFixed(0)} ms (500 steps), ` +
      `ratio ${ratio.toFixed(2)} (medians ${median(small.paints).toFixed(0)} / ${median(large.paints).toFixed(0)} ms; 500 steps, slowest keys ${slowest(large.paints)}); longest task while typing ${longest.toFixed(0)} ms at 500 steps, ${demoLongest.toFixed(0)} ms at 3 steps ` +
      `(3 steps: ${small.longTasks.length} long tasks, 500 steps: ${large.longTasks.length}); ` +
      `graph shown ${small.graphShown.toFixed(0)} ms after navigation (3 steps), ${large.graphShown.toFixed(0)} ms (500 steps); ` +
      // Wall-clock tasks swell with the machine's load; the main thread's CPU time does not.
      `by CPU time: longest task ${Math.max(0, ...large.cpuTasks).toFixed(0)} ms at 500 steps, ${Math.max(0, ...small.cpuTasks).toFixed(0)} ms at 3 steps, ` +
      `main thread busy ${sum(large.cpuTasks).toFixed(0)} ms (500 steps) / ${sum(small.cpuTasks).toFixed(0)} ms (3 steps) = ${(sum(large.cpuTasks) / sum(small.cpuTasks)).toFixed(2)}`,
  );
  expect(ratio).toBeLessThanOrEqual(1.5);
  expect(longest).toBeLessThan(50);
});
