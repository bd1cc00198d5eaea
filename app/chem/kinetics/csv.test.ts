import { describe, expect, it } from "vitest";
import { CsvError, readMeasuredCsv, residuals, simulationCsv } from "./csv";

describe("CSV time courses", () => {
  it("reads a time column and species columns, empty cells as not measured", () => {
    const { data, warnings } = readMeasuredCsv("time,A,B,note\n0,1,0,1\n1,0.5,,2\n2,0.25,0.7,3\n", { species: ["A", "B"] });
    expect(data.time).toEqual([0, 1, 2]);
    expect(data.series).toEqual({ A: [1, 0.5, 0.25], B: [0, null, 0.7] });
    expect(warnings).toEqual(['the column "note" is not a species of this model and was ignored']);
  });

  it.each([
    ["A,B\n1,2\n", /"time" column/],
    ["time,A\n0,1\n0,2\n", /line 3: times must increase/],
    ["time,A\n0,abc\n", /line 2, column "A": "abc" is not a number/],
    ["time,A\n0,-1\n", /cannot be negative/],
    ["time,A,A\n0,1,1\n", /appears twice/],
    ["time,A\n0,1,2\n", /line 2: expected 2 cells, found 3/],
    ["time,A\n", /at least one line of data/],
  ])("explains what is wrong with %j", (text, message) => {
    expect(() => readMeasuredCsv(text)).toThrow(CsvError);
    expect(() => readMeasuredCsv(text)).toThrow(message);
  });

  it("refuses files over the size limit", () => {
    expect(() => readMeasuredCsv("time,A\n" + "0,1\n".repeat(1_500_000))).toThrow(/larger than 5 MiB/);
  });

  it("measures residuals against a linearly interpolated simulation", () => {
    const simulated = { t: [0, 1, 2], series: { A: [1, 0.5, 0.25] } };
    const measured = { time: [0.5, 1.5, 3], series: { A: [0.8, 0.375, 0.1] } };
    const { A } = residuals(measured, simulated);
    expect(A.points).toBe(2); // t = 3 lies outside the run
    expect(A.residuals[0].simulated).toBeCloseTo(0.75, 12);
    expect(A.rms).toBeCloseTo(Math.sqrt((0.05 ** 2 + 0) / 2), 12);
  });

  it("exports a simulation that reads back", () => {
    const text = simulationCsv({ t: [0, 0.5], series: { A: [1, 0.123456789012345], "Fe3+": [0, 1e-12] } });
    expect(text.split("\n")[0]).toBe("time,A,Fe3+");
    const { data } = readMeasuredCsv(text);
    expect(data.series.A[1]).toBe(0.123456789012345);
    expect(data.series["Fe3+"][1]).toBe(1e-12);
  });

  it("exports species names safe from formulas, and negative values as numbers", () => {
    const text = simulationCsv({ t: [0, 1], series: { "=SUM(A1)": [1, -2.5e-3], "-B": [0, -1] } });
    const [header, , second] = text.split("\n");
    expect(header).toBe("time,'=SUM(A1),'-B");
    expect(second).toBe("1,-0.0025,-1");
    expect(readMeasuredCsv(text.replace("-0.0025", "0.0025").replace(",-1", ",1")).data.series).toEqual({ "=SUM(A1)": [1, 0.0025], "-B": [0, 1] });
  });
});
