import { describe, expect, it } from "vitest";
import { safeNext } from "./auth.server";

describe("safeNext", () => {
  it("keeps paths on this site, with their query and fragment", () => {
    expect(safeNext("/m/abc?tab=graph#top")).toBe("/m/abc?tab=graph#top");
    expect(safeNext("/settings/tokens")).toBe("/settings/tokens");
  });

  it("refuses everything a browser would follow to another host", () => {
    for (const next of ["//evil.example", "/\\evil.example/x", "\\\\evil.example", "/\t/evil.example/x", "/\n/evil.example", "/\r\n/evil.example", "/..//evil.example", "/./\\evil.example", "https://evil.example", "javascript:alert(1)", ""]) {
      expect(safeNext(next), JSON.stringify(next)).toBe("/dashboard");
    }
    expect(safeNext(null)).toBe("/dashboard");
  });
});
