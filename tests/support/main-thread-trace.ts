// The page's main-thread tasks from a Chromium trace, each with its wall time and its CPU (thread)
// time. On a shared machine the two part: a task the scheduler interrupts keeps running on the
// clock while the thread waits for a core, so its wall time counts other processes' work too.
import type { Page } from "playwright-core";

export interface MainThreadTasks {
  /** Wall time of each task, ms. */
  wall: number[];
  /** CPU time of the renderer's main thread in each task, ms. */
  cpu: number[];
}

interface TraceEvent {
  name: string;
  ph: string;
  pid: number;
  tid: number;
  dur?: number;
  tdur?: number;
  args?: { name?: string };
}

/** Starts tracing the page's tasks; the returned function stops and reads them. */
export async function traceMainThread(page: Page): Promise<() => Promise<MainThreadTasks>> {
  const cdp = await page.context().newCDPSession(page);
  // Only the task events: the sampling categories would cost more than what they measure.
  await cdp.send("Tracing.start", { transferMode: "ReturnAsStream", traceConfig: { includedCategories: ["toplevel"] } });
  return async () => {
    const complete = new Promise<{ stream?: string }>((resolve) => cdp.once("Tracing.tracingComplete", resolve));
    await cdp.send("Tracing.end");
    const { stream } = await complete;
    if (!stream) throw new Error("The trace came back without a stream.");
    let text = "";
    for (;;) {
      const chunk = await cdp.send("IO.read", { handle: stream });
      text += chunk.base64Encoded ? Buffer.from(chunk.data, "base64").toString("utf8") : chunk.data;
      if (chunk.eof) break;
    }
    await cdp.send("IO.close", { handle: stream });
    await cdp.detach();
    const parsed = JSON.parse(text) as { traceEvents?: TraceEvent[] } | TraceEvent[];
    return mainThreadTasks(Array.isArray(parsed) ? parsed : (parsed.traceEvents ?? []));
  };
}

function mainThreadTasks(events: TraceEvent[]): MainThreadTasks {
  const thread = (event: TraceEvent) => `${event.pid}:${event.tid}`;
  const mains = new Set(events.filter((event) => event.name === "thread_name" && event.args?.name === "CrRendererMain").map(thread));
  const tasks = events.filter((event) => event.ph === "X" && event.name === "ThreadControllerImpl::RunTask" && mains.has(thread(event)));
  // The busiest renderer main thread is the page's.
  const counts = new Map<string, number>();
  for (const task of tasks) counts.set(thread(task), (counts.get(thread(task)) ?? 0) + 1);
  const page = [...counts].sort((a, b) => b[1] - a[1])[0]?.[0];
  const mine = tasks.filter((task) => thread(task) === page);
  return { wall: mine.map((task) => (task.dur ?? 0) / 1000), cpu: mine.map((task) => (task.tdur ?? 0) / 1000) };
}
