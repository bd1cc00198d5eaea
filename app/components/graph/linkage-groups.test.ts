import { describe, expect, it } from "vitest";
import { analyzeSource } from "~/chem/analysis";
import { generatedOxidation } from "../../../tests/fixtures/generated-oxidation";
import { classBoxCorner, classBoxLabel, classKey, foldFromSteps, startsFolded } from "./linkage-groups";

describe("folding linkage classes", () => {
  it("leaves a small mechanism unfolded", async () => {
    const report = await analyzeSource("A -> B @ 1\nC -> D @ 1\n");
    expect(startsFolded(report).size).toBe(0);
  });

  it("starts a large one with every class folded but the largest", async () => {
    const report = await analyzeSource(generatedOxidation(foldFromSteps));
    const folded = startsFolded(report);
    const sizes = report.linkageClasses.map((members) => members.length);
    const open = sizes.findIndex((_, index) => !folded.has(index));
    expect(folded.size).toBe(report.linkageClasses.length - 1);
    expect(sizes[open]).toBe(Math.max(...sizes));
  });

  it("names a folded class and its size, and keys it by its first complex", async () => {
    const report = await analyzeSource("X -> Y @ 1\nA -> B @ 1\nB -> C @ 1\n");
    expect(classBoxLabel(1, 3)).toBe("class 2 · 3 complexes");
    expect(classBoxLabel(0, 1)).toBe("class 1 · 1 complex");
    expect(classKey(report, 1)).toBe("A");
    expect(classBoxCorner([{ x: 40, y: 5 }, { x: 10, y: 30 }])).toEqual({ x: 10, y: 5 });
  });
});
