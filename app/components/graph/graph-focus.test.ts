import { describe, expect, it } from "vitest";
import { analyzeSource } from "~/chem/analysis";
import { caretStepIndex, findEntries, neighbourhood, searchEntries } from "./graph-focus";

// Complexes: 0 "A + B", 1 "C", 2 "2C", 3 "D", 4 "E"
const source = "r1: A + B <=> C @ 1, 2\nr2: 2C -> D @ 3\nD -> E @ 4\nr4: Xe -> Ab @ 1\n";

describe("search and focus", async () => {
  const report = await analyzeSource(source);
  const entries = searchEntries(report);

  it("finds species and steps by name, exact names first, an unlabelled step by its line", () => {
    expect(entries.filter(({ kind }) => kind === "step").map(({ name }) => name)).toEqual(["r1", "r2", "line 3", "r4"]);
    expect(findEntries(entries, "c").map(({ name }) => name)[0]).toBe("C");
    expect(findEntries(entries, "R").map(({ name }) => name)).toEqual(["r1", "r2", "r4"]);
    expect(findEntries(entries, "  ")).toEqual([]);
    expect(findEntries(entries, "zz")).toEqual([]);
  });

  it("lights a step's reactions, complexes and species", () => {
    const around = neighbourhood(report, { kind: "step", index: 0 });
    expect([...around.reactions].map((index) => report.reactions[index]).map(({ from, to }) => `${report.complexes[from]}>${report.complexes[to]}`)).toEqual([
      "A + B>C",
      "C>A + B",
    ]);
    expect([...around.complexes].map((index) => report.complexes[index]).sort()).toEqual(["A + B", "C"]);
    expect([...around.species].map((index) => report.species[index]).sort()).toEqual(["A", "B", "C"]);
  });

  it("lights every step a species takes part in", () => {
    const c = report.species.indexOf("C");
    const around = neighbourhood(report, { kind: "species", index: c });
    expect([...around.steps]).toEqual([0, 1]);
    expect([...around.complexes].map((index) => report.complexes[index]).sort()).toEqual(["2C", "A + B", "C", "D"]);
    expect(around.species.has(report.species.indexOf("E"))).toBe(false);
  });

  it("finds the caret's step by label, or by line when it has none", () => {
    expect(caretStepIndex(report, { label: "r2", line: 99 })).toBe(1);
    expect(caretStepIndex(report, { label: null, line: 3 })).toBe(2);
    expect(caretStepIndex(report, { label: "gone", line: 1 })).toBeNull();
    expect(caretStepIndex(report, null)).toBeNull();
  });
});
