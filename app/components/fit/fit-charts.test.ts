import { describe, expect, it } from "vitest";
import type { ExperimentResiduals, SensitivityResult } from "~/chem/fit/types";
import { cellInk, divergingColour } from "./colour-scale";
import { peakSensitivities, residualPicture, residualSpecies, sensitivityPicture } from "./fit-charts";

const residuals: ExperimentResiduals[] = [
  { experiment: "run 1", species: { A: [{ t: 0, measured: 1, simulated: 1.1, residual: 0.1 }, { t: 2, measured: 0.5, simulated: 0.4, residual: -0.1 }] } },
  { experiment: "run 2", species: { A: [{ t: 1, measured: 0.7, simulated: 0.72, residual: 0.02 }], B: [{ t: 1, measured: 0.2, simulated: 0.1, residual: -0.1 }] } },
];

describe("the Fit panel's pictures", () => {
  it("puts every data set's residuals on one merged time axis, as markers, symmetric about zero", () => {
    expect(residualSpecies(residuals)).toEqual(["A", "B"]);
    const picture = residualPicture(residuals, "A", false);
    expect(picture.x.values).toEqual([0, 1, 2]);
    expect(picture.series.map((s) => [s.name, s.values, s.markers])).toEqual([
      ["run 1", [0.1, null, -0.1], true],
      ["run 2", [null, 0.02, null], true],
    ]);
    expect(picture.y.min).toBeLessThan(-0.1);
    expect(picture.y.max).toBeGreaterThan(0.1);
    expect(residualPicture(residuals, "A", true).y.label).toBe("residual of A / sd");
  });

  it("takes the signed peak of each sensitivity over the run, skipping values that mean nothing", () => {
    const result: SensitivityResult = {
      t: [0, 1, 2],
      parameters: ["k1", "k2"],
      series: { A: [1, 0.5, 0.2] },
      normalized: { A: { k1: [0, -1, -2], k2: [null, 0.3, 0.1] } },
    };
    expect(peakSensitivities(result)).toEqual({ A: { k1: -2, k2: 0.3 } });
    expect(sensitivityPicture(result, "A").series.map((s) => s.name)).toEqual(["k1", "k2"]);
  });

  it("colours negative teal, positive copper, stronger for larger magnitude, clamped at 1", () => {
    expect(divergingColour(-1)).toBe("rgba(15, 138, 140, 0.900)");
    expect(divergingColour(0.5)).toBe("rgba(196, 98, 45, 0.490)");
    expect(divergingColour(7)).toBe(divergingColour(1));
    expect(divergingColour(Number.NaN)).toBe("transparent");
    expect(cellInk(0.9)).toBe("#ffffff");
    expect(cellInk(0.1)).toBe("inherit");
  });
});
