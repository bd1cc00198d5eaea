import { describe, expect, it } from "vitest";
import { readMechanismText } from "./text-reader";

describe("the diagnostics the editor shows", () => {
  it("passes the parser's messages and ranges to the editor, inside the document", async () => {
    // The broken first line contributes nothing, so its k is not reported as missing.
    const source = "X + -> Y @ k\nY -> Z";
    const diagnostics = await readMechanismText("diagnostics", source);
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
