import { describe, expect, it } from "vitest";
import { CsvError } from "~/chem/kinetics/csv";
import { readExperimentCsv } from "./experiment-csv";

const species = ["A", "B", "C"];

describe("an experiment from a CSV", () => {
  it("reads its settings from comment lines above the header, and free comments as comments", () => {
    const text = "# run 7, invented\n# T = 350\n# [A]0 = 0.002\n#\ntime,B,C\n0,0,0\n1,0.5,\n";
    const { experiment } = readExperimentCsv(text, "run-7.csv", { species });
    expect(experiment).toEqual({
      name: "run-7.csv",
      settings: { parameters: { T: 350 }, initial: { A: 0.002 } },
      time: [0, 1],
      series: { B: [0, 0.5], C: [0, null] },
    });
  });

  it("pairs sd(X) columns with their species, leaving out deviations of empty cells", () => {
    const { experiment } = readExperimentCsv("time,B,sd(B)\n0,1,0.1\n1,,0\n2,0.5,0.05\n", "x", { species });
    expect(experiment.series.B).toEqual([1, null, 0.5]);
    expect(experiment.sd).toEqual({ B: [0.1, null, 0.05] });
  });

  it.each([
    ["# T = hot\ntime,B\n0,1\n", /line 1: T = hot: the value must be a number/],
    ["time,B,Q\n0,1,1\n", /"Q" is not a species of the model/],
    ["time,sd(B)\n0,1\n", /"sd\(B\)" has no column "B"/],
    ["time,B,sd(B),C\n0,1,0.1,1\n", /"sd\(C\)" is missing/],
    ["time,B,sd(B)\n0,1,0\n", /standard deviation is missing or not positive/],
    ["# [A]0 = 1\n# note\ntime,B\n0,1\n1,x\n", /line 5, column "B": "x" is not a number/],
  ])("explains what is wrong with %j", (text, message) => {
    expect(() => readExperimentCsv(text, "x", { species })).toThrow(CsvError);
    expect(() => readExperimentCsv(text, "x", { species })).toThrow(message);
  });
});
