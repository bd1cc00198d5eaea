import { describe, expect, it } from "vitest";
import { hasPositiveConservationLaw } from "./conservation";

describe("hasPositiveConservationLaw", () => {
  it("finds a positive combination when no basis vector is positive (A + B → C: A + B + 2C)", async () => {
    expect(await hasPositiveConservationLaw([[1, 0, 1], [0, 1, 1]], 3)).toBe(true);
  });

  it("answers no when every law sums to zero against a reaction vector (0 → A + B + C)", async () => {
    expect(await hasPositiveConservationLaw([[1, 0, -1], [0, 1, -1]], 3)).toBe(false);
  });

  it("answers no without any law, or when a species has weight 0 in all of them", async () => {
    expect(await hasPositiveConservationLaw([], 2)).toBe(false);
    expect(await hasPositiveConservationLaw([[1, 0, 1]], 3)).toBe(false);
  });
});
