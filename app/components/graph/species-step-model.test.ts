import { describe, expect, it } from "vitest";
import { analyzeSource } from "~/chem/analysis";
import { generatedOxidation } from "../../../tests/fixtures/generated-oxidation";
import type { XY } from "./layout";
import { buildSpeciesStepModel, estimateSpeciesStepSize, hubSpecies, layoutSpeciesSteps, onlySteps, type SpeciesStepModel, speciesNodeIds, withHubs } from "./species-step-model";

function overlappingPairs(model: SpeciesStepModel, placed: Record<string, XY>): number {
  const boxes = model.nodes.map((node) => ({ ...placed[node.id], ...estimateSpeciesStepSize(node) }));
  let overlaps = 0;
  for (let i = 0; i < boxes.length; i++)
    for (let j = i + 1; j < boxes.length; j++) {
      const [a, b] = [boxes[i], boxes[j]];
      if (a.x < b.x + b.width && b.x < a.x + a.width && a.y < b.y + b.height && b.y < a.y + a.height) overlaps++;
    }
  return overlaps;
}

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

  it("draws a hub species as a copy beside each step that uses it, or leaves it out", async () => {
    // An invented network with a third body M in three of its four steps.
    const report = await analyzeSource("a: A + M -> B + M @ 1\nb: C + M -> D + M @ 2\nc: E + M -> F + M @ 3\nd: A + C -> 2E @ 4\n");
    const model = buildSpeciesStepModel(report);
    const m = report.species!.indexOf("M");
    expect(hubSpecies(model, 3)).toEqual([m]);
    expect(hubSpecies(model, 4)).toEqual([]);

    const copies = withHubs(model, new Set([m]), "copies");
    expect(copies.nodes.filter((node) => node.label === "M").map(({ id, kind }) => [id, kind])).toEqual([
      ["copy:M@0", "copy"],
      ["copy:M@1", "copy"],
      ["copy:M@2", "copy"],
    ]);
    // Each copy sits in its step's class, and both of the step's arcs to M meet the one copy.
    expect(copies.arcs.filter((arc) => arc.step === 0 && arc.species === m).map(({ source, target }) => [source, target])).toEqual([
      ["copy:M@0", "step:0"],
      ["step:0", "copy:M@0"],
    ]);
    expect(copies.nodes.find((node) => node.id === "copy:M@1")?.linkageClass).toBe(model.nodes.find((node) => node.id === "step:1")?.linkageClass);
    expect(speciesNodeIds(copies).get(m)).toEqual(["copy:M@0", "copy:M@1", "copy:M@2"]);
    expect(copies.arcs).toHaveLength(model.arcs.length);

    const hidden = withHubs(model, new Set([m]), "hidden");
    expect(hidden.nodes.some((node) => node.label === "M")).toBe(false);
    expect(hidden.arcs).toHaveLength(model.arcs.length - 6);
    expect(withHubs(model, new Set([m]), "once")).toBe(model);

    // A neighbourhood on its own: step d and the species it reaches.
    expect(onlySteps(copies, new Set([3])).nodes.map(({ id }) => id).sort()).toEqual(["species:A", "species:C", "species:E", "step:3"]);
  });

  it("lays 500 steps out with no two nodes overlapping", { timeout: 120_000 }, async () => {
    const model = buildSpeciesStepModel(await analyzeSource(generatedOxidation(500)));
    const placed = layoutSpeciesSteps(model);
    expect(model.nodes.length).toBeGreaterThan(600);
    expect(overlappingPairs(model, placed)).toBe(0);
    // The same model always gets the same picture.
    expect(layoutSpeciesSteps(model)).toEqual(placed);
  });

  it("lays 500 steps out with their hubs as copies, no two nodes overlapping, each copy beside its step", { timeout: 120_000 }, async () => {
    const base = buildSpeciesStepModel(await analyzeSource(generatedOxidation(500)));
    const model = withHubs(base, new Set(hubSpecies(base, 16)), "copies");
    const placed = layoutSpeciesSteps(model);
    expect(overlappingPairs(model, placed)).toBe(0);
    const copies = model.nodes.filter((node) => node.kind === "copy");
    expect(copies.length).toBeGreaterThan(40);
    // Centre to centre, every copy sits within about two arc lengths of its step.
    const centre = (id: string) => {
      const size = estimateSpeciesStepSize(model.nodes.find((node) => node.id === id)!);
      return { x: placed[id].x + size.width / 2, y: placed[id].y + size.height / 2 };
    };
    const far = copies.filter((copy) => {
      const [a, b] = [centre(copy.id), centre(`step:${copy.id.split("@")[1]}`)];
      return Math.hypot(a.x - b.x, a.y - b.y) > 150;
    });
    expect(far).toEqual([]);
  });
});
