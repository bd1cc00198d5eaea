// Typing stays fast at 500 steps: the same two lines of 40 keystrokes typed into the 3-step demo
// mechanism and into a generated 500-step one, in one run on one machine. Measured in the page: each keystroke's
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
/**
 * Two new steps, so the structure (and the graph) changes while each is typed: 40 keys each with
 * the Enter. The first is typed into a freshly opened page, the second right after it.
 */
const passes = ["\nqq: AB + CD -> XY + ZZ @ 2.5e9 # typing", "\nqr: AC + CE -> XZ + ZY @ 3.5e9 # second"] as const;
const demo = demoMechanisms[0].source;
let owner: Awaited<ReturnType<typeof signUp>>;

beforeAll(async () => {
  owner = await signUp(world.server.url, "Tara Typist");
});

interface PassCost {
  /** Key event to painted frame, ms, one per keystroke. */
  paints: number[];
  /** Durations of the long tasks seen while typing, ms. */
  longTasks: number[];
  /** The page's main-thread tasks while typing, by CPU time, ms: what the page itself costs. */
  cpuTasks: number[];
}

interface TypingCost {
  /** The first line, in a freshly opened page: its code is still being compiled as it runs. */
  cold: PassCost;
  /** The second line: typing once the page has warmed up. */
  warm: PassCost;
  /** From the start of navigation to the first drawn complex of the graph, ms. */
  graphShown: number;
}

/** Opens the mechanism, waits until its graph is drawn, and types both lines at the end of the text. */
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
  await instrument(page);
  const cold = await typeLine(page, passes[0]);
  const warm = await typeLine(page, passes[1]);
  await page.context().close();
  return { cold, warm, graphShown };
}

/** Types one line at about eight keys a second, a quick typist, and measures it. */
async function typeLine(page: Page, line: string): Promise<PassCost> {
  const before = await revision(page);
  await page.evaluate(() => ((window as unknown as { typingCost: unknown }).typingCost = { paints: [], longTasks: [] }));
  const stopTrace = await traceMainThread(page);
  await page.keyboard.type(line, { delay: 120 });
  // The analysis of the last keystroke, and whatever the page does with it, belong to typing.
  const marker = line.slice(line.indexOf("#"));
  await expect.poll(() => page.evaluate((marker) => document.querySelector(".cm-content")?.textContent?.includes(marker), marker), patience).toBe(true);
  await expect.poll(async () => (await revision(page)) > before, patience).toBe(true);
  // Late work is counted too.
  await quiet(page, 1000);
  const { cpu } = await stopTrace();
  const cost = await page.evaluate(() => (window as unknown as { typingCost: Pick<PassCost, "paints" | "longTasks"> }).typingCost);
  return { ...cost, cpuTasks: cpu };
}

/** The room's analysis revision, which the status badge carries in its title. */
async function revision(page: Page): Promise<number> {
  const title = (await page.getAttribute("[data-testid=room-status]", "title")) ?? "";
  return Number(/revision (\d+)/.exec(title)?.[1] ?? 0);
}

/** Starts recording in the page: key-to-paint per keystroke and long tasks. */
function instrument(page: Page) {
  return page.evaluate(() => {
    // Each line starts a fresh record (typeLine); the observers write to the current one.
    const cost = () => (window as unknown as { typingCost: { paints: number[]; longTasks: number[] } }).typingCost;
    new PerformanceObserver((list) => {
      for (const entry of list.getEntries()) cost().longTasks.push(entry.duration);
    }).observe({ type: "longtask" });
    // The key event's own time stamp counts the wait for a busy main thread too.
    let pressed: number | null = null;
    document.addEventListener("keydown", (event) => (pressed = event.timeStamp), { capture: true });
    // The text changed: the frame after the next animation frame is the one that shows it.
    new MutationObserver(() => {
      if (pressed === null) return;
      const start = pressed;
      pressed = null;
      requestAnimationFrame(() => setTimeout(() => cost().paints.push(performance.now() - start)));
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

/** The five slowest keystrokes of a line as "61 ms at 'X'". */
const slowest = (paints: number[], line: string) =>
  paints
    .map((ms, index) => ({ ms, key: JSON.stringify(line[index]) }))
    .sort((a, b) => b.ms - a.ms)
    .slice(0, 5)
    .map(({ ms, key }) => `${ms.toFixed(0)} ms at ${key}`)
    .join(", ");
const median = (values: number[]) => [...values].sort((a, b) => a - b)[Math.floor(values.length / 2)];
const p95 = (values: number[]) => [...values].sort((a, b) => a - b)[Math.ceil(values.length * 0.95) - 1];
const sum = (values: number[]) => values.reduce((total, value) => total + value, 0);
const longest = (values: number[]) => Math.max(0, ...values);

/** One line's figures, 500 steps against the demo; returns the p95 ratio. */
function report(label: string, small: PassCost, large: PassCost, line: string): number {
  const ratio = p95(large.paints) / p95(small.paints);
  console.log(
    `typing, ${label}: key-to-paint p95 ${p95(small.paints).toFixed(0)} ms (3 steps), ${p95(large.paints).toFixed(0)} ms (500 steps), ratio ${ratio.toFixed(2)}; ` +
      `medians ${median(small.paints).toFixed(0)} / ${median(large.paints).toFixed(0)} ms; slowest keys at 500 steps ${slowest(large.paints, line)}; ` +
      `longest task ${longest(large.longTasks).toFixed(0)} ms at 500 steps (${large.longTasks.length} of 50 ms or more), ${longest(small.longTasks).toFixed(0)} ms at 3 steps (${small.longTasks.length}); ` +
      // Wall-clock tasks swell with the machine's load; the main thread's CPU time does not.
      `by CPU time: longest task ${longest(large.cpuTasks).toFixed(0)} / ${longest(small.cpuTasks).toFixed(0)} ms, ` +
      `main thread busy ${sum(large.cpuTasks).toFixed(0)} / ${sum(small.cpuTasks).toFixed(0)} ms = ${(sum(large.cpuTasks) / sum(small.cpuTasks)).toFixed(2)}`,
  );
  return ratio;
}

// Runs with TYPING_BENCHMARK=1. The targets are on wall time, which this shared machine's load
// swells: tasks of 50–139 ms there were 10–30 ms of the main thread's CPU time, which is printed
// beside them (DEVELOPERS.md, Performance notes). So this is left out of the default suite, which
// must not fail on load. The targets are judged on the second line: in the first, V8 is still
// compiling the page's code on the same two cores (DEVELOPERS.md); both are printed.
it.runIf(process.env.TYPING_BENCHMARK === "1")("types as fast into 500 steps as into the 3-step demo, and no task blocks the page", { timeout: 900_000 }, async () => {
  const small = await typingCost(demo);
  const large = await typingCost(generatedOxidation(500));
  for (const cost of [small, large]) for (const [index, pass] of [cost.cold, cost.warm].entries()) expect(pass.paints.length).toBe(passes[index].length);
  console.log(`typing: graph shown ${small.graphShown.toFixed(0)} ms after navigation (3 steps), ${large.graphShown.toFixed(0)} ms (500 steps)`);
  report("first line, fresh page", small.cold, large.cold, passes[0]);
  const ratio = report("second line", small.warm, large.warm, passes[1]);
  expect(ratio).toBeLessThanOrEqual(1.5);
  expect(longest(large.warm.longTasks)).toBeLessThan(50);
});
