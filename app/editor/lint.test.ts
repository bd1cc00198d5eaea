import { describe, expect, it } from "vitest";
import { mechanismDiagnostics } from "./lint";

describe("editor diagnostics", () => {
  it("come from the shared parser with offsets inside the text", () => {
    const source = "X -> Y @ k9\nY -> Y @ 1\n";
    const diagnostics = mechanismDiagnostics(source);
    expect(diagnostics.length).toBeGreaterThan(0);
    expect(diagnostics.some((d) => d.severity === "error")).toBe(true);
    for (const d of diagnostics) {
      expect(d.from).toBeGreaterThanOrEqual(0);
      expect(d.to).toBeLessThanOrEqual(source.length);
      expect(d.to).toBeGreaterThanOrEqual(d.from);
    }
  });

  it("are empty for a clean mechanism", () => {
    expect(mechanismDiagnostics("X + Y -> 2Y @ k2\nk2 = 1\n")).toEqual([]);
  });
});
