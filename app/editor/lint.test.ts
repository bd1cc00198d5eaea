import { describe, expect, it } from "vitest";
import { mechanismDiagnostics } from "./lint";

describe("mechanismDiagnostics", () => {
  it("passes the parser's messages and ranges to the editor, inside the document", () => {
    // The broken first line contributes nothing, so its k is not reported as missing.
    const source = "X + -> Y @ k\nY -> Z";
    const diagnostics = mechanismDiagnostics(source);
    expect(diagnostics.map(({ severity, from }) => [severity, from])).toEqual([
      ["error", 4],
      ["warning", 13],
    ]);
    for (const { from, to } of diagnostics) {
      expect(from).toBeGreaterThanOrEqual(0);
      expect(to).toBeLessThanOrEqual(source.length);
    }
  });
});
