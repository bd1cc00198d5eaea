import { createElement } from "react";
import { renderToString } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { FitStatus, fitProgressText } from "./fit-progress";

const running = { running: true, progress: 0.035, queued: null, result: null, error: null };

describe("a running fit's progress", () => {
  it("says the iterations and the cost's fall, not a share of the iteration cap", () => {
    const notes = [
      { iteration: 1, cost: 1.5 },
      { iteration: 7, cost: 3.2e-4 },
    ];
    const html = renderToString(createElement(FitStatus, { job: { ...running, notes } }));
    expect(html).toContain("Iteration 7 · cost 3.2×10⁻⁴, down from 1.5 (×4688 lower)");
    expect(html).not.toContain("%");
    expect(html).not.toContain("progressbar");
  });

  it("says only the cost before it has fallen, and leaves queued and other jobs to the usual status", () => {
    expect(fitProgressText({ iteration: 1, cost: 2 }, { iteration: 1, cost: 2 })).toBe("Iteration 1 · cost 2");
    expect(renderToString(createElement(FitStatus, { job: { ...running, queued: 2, notes: [{ iteration: 1, cost: 2 }] } }))).toContain("Queued (1 ahead)");
    expect(renderToString(createElement(FitStatus, { job: { ...running, notes: [] } }))).toContain("progressbar");
  });
});
