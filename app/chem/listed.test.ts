import { describe, expect, it } from "vitest";
import { listed } from "./listed";

describe("listed", () => {
  it("writes one, two and several items as a sentence does", () => {
    expect(listed([])).toBe("");
    expect(listed(["X"])).toBe("X");
    expect(listed(["X", "Y"])).toBe("X and Y");
    expect(listed(["X", "Y", "Z"])).toBe("X, Y and Z");
  });

  it("names the first few of a long list and counts the rest", () => {
    expect(listed(["1", "2", "3", "4"], 4)).toBe("1, 2, 3 and 4");
    expect(listed(["1", "2", "3", "4", "5", "6"], 4)).toBe("1, 2, 3, 4 and 2 more");
  });
});
