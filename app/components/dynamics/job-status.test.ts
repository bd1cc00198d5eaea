import { createElement } from "react";
import { renderToString } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { JobStatus } from "./job-status";

const job = { running: true, progress: 0, queued: null as number | null, notes: [], result: null, error: null };

describe("JobStatus", () => {
  it("shows a waiting job's place in the queue, then the progress bar once it runs", () => {
    // The stream sends the 1-based place; the panel counts the jobs ahead.
    expect(renderToString(createElement(JobStatus, { job: { ...job, queued: 1 } }))).toContain("Queued (0 ahead)");
    expect(renderToString(createElement(JobStatus, { job: { ...job, queued: 3 } }))).toContain("Queued (2 ahead)");
    const running = renderToString(createElement(JobStatus, { job: { ...job, progress: 0.4 } }));
    expect(running).toContain(`aria-valuenow="40"`);
    expect(running).not.toContain("ahead");
  });
});
