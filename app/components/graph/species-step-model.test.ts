import { describe, expect, it } from "vitest";
import { analyzeSource } from "~/chem/analysis";
import { generatedOxidation } from "../../../tests/fixtures/generated-oxidation";
import { buildSpeciesStepModel, estimateSpeciesStepSize, layoutSpeciesSteps } from "./species-step-model";

describe("the species–step view", () => {
  it("has a node per species and per step, arcs labelled only above 1, fixed species left out", async () => {
    const report = await analyzeSource("fixed [F] = 1\nr1: 2A + F <=> B @ 1, 2\nB -> A + C @ 3\n");
    const model = buildSpeciesStepModel(report);
    expect(model.nodes.map(({ id, label }) => [id, label])).toEqual([
      ["species:A", "A"],
      ["species:B", "B"],
      ["species:C", "C"],
      ["step:0", "r1"],
      ["step:1", "line 3"],
    ]);
    expect(model.arcs.map(({ source, target, label, twoWay }) => [source, target, label, twoWay])).toEqual([
      ["species:A", "step:0", "2", true],
      ["step:0", "species:B", null, true],
      ["species:B", "step:1", null, false],
      ["step:1", "species:A", null, false],
      ["step:1", "species:C", null, false],
    ]);
  });

  it("lays 500 steps out with no two nodes overlapping", { timeout: 120_000 }, async () => {
    const model = buildSpeciesStepModel(await analyzeSource(generatedOxidation(500)));
    const placed = layoutSpeciesSteps(model);
    const boxes = model.nodes.map((node) => ({ ...placed[node.id], ...estimateSpeciesStepSize(node) }));
    let overlaps = 0;
    for (let i = 0; i < boxes.length; i++)
      for (let j = i + 1; j < boxes.length; j++) {
        const [a, b] = [boxes[i], boxes[j]];
        if (a.x < b.x + b.width && b.x < a.x + a.width && a.y < b.y + b.height && b.y < a.y + a.height) overlaps++;
      }
    expect(boxes.length).toBeGreaterThan(600);
    expect(overlaps).toBe(0);
    // The same model always gets the same picture.
    expect(layoutSpeciesSteps(model)).toEqual(placed);
  });
});
