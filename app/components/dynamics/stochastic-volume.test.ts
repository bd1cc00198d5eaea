import { describe, expect, it } from "vitest";
import { defaultVolume, FALLBACK_VOLUME, MAX_DEFAULT_TOTAL_COPIES, startingCopies } from "./stochastic-volume";

describe("the stochastic card's default volume", () => {
  it("gives the scarcest species present a few hundred copies at 1e-4 mol/L", () => {
    const initial = { A: 1e-4, B: 2e-4, C: 0 };
    const volume = defaultVolume(initial);
    expect(volume).toBe(5e6);
    const copies = Object.fromEntries(startingCopies(initial, volume));
    expect(copies).toEqual({ A: 500, B: 1000, C: 0 });
  });

  it("keeps the scarcest species within 200–500 copies over many decades", () => {
    for (const c of [3e-9, 1.7e-4, 0.042, 1, 7.3, 1e4]) {
      const copies = c * defaultVolume({ X: c });
      expect(copies).toBeGreaterThan(200);
      expect(copies).toBeLessThanOrEqual(500 + 1e-6);
    }
  });

  it("caps the total when one species outnumbers the scarcest by far", () => {
    const initial = { fuel: 1, trace: 1e-6 };
    const volume = defaultVolume(initial);
    const total = startingCopies(initial, volume).reduce((sum, [, n]) => sum + n, 0);
    expect(total).toBeLessThanOrEqual(MAX_DEFAULT_TOTAL_COPIES);
    expect(total).toBeGreaterThan(MAX_DEFAULT_TOTAL_COPIES / 5);
  });

  it("keeps the old volume when nothing is present at the start", () => {
    expect(defaultVolume({})).toBe(FALLBACK_VOLUME);
    expect(defaultVolume({ A: 0 })).toBe(FALLBACK_VOLUME);
  });
});
