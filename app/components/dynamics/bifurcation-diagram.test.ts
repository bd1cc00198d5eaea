import { createElement } from "react";
import { renderToString } from "react-dom/server";
import { describe, expect, it } from "vitest";
import type { ContinuationResult } from "~/chem/kinetics/continuation";
import { parseMechanism } from "~/chem/parse";
import { continueEquilibria } from "~/chem/kinetics/continuation";
import { BifurcationDiagram, bifurcationLabels, branchPieces } from "./bifurcation-diagram";
import { mostChanging } from "./continuation-card";

const point = (value: number, x: number, stable: boolean | null) => ({ value, state: { X: x }, stable });

describe("the bifurcation diagram", () => {
  it("splits the branch where its stability changes, each piece starting where the last ended", () => {
    const pieces = branchPieces([point(1, 1, true), point(2, 2, true), point(3, 3, false), point(2, 4, false), point(3, 5, true)], "X");
    expect(pieces.map((p) => [p.stable, p.points.map((q) => q.y)])).toEqual([
      [true, [1, 2]],
      [false, [2, 3, 4]],
      [true, [4, 5]],
    ]);
  });

  it("shows first the species that changes most along the branch", () => {
    const points = [{ value: 1, state: { X: 1, Y: 1 }, stable: true }, { value: 2, state: { X: 1, Y: 2 }, stable: true }];
    expect(mostChanging({ points, bifurcations: [], ended: "range", summary: "" })).toBe("Y");
  });

  it("numbers folds and Hopf points separately", () => {
    const at = { value: 1, state: {} };
    expect(bifurcationLabels([{ kind: "fold", ...at }, { kind: "hopf", ...at }, { kind: "fold", ...at }])).toEqual(["F1", "H1", "F2"]);
  });

  it("draws Schlögl's branch solid, dashed, solid with both folds labelled", () => {
    const { mechanism } = parseMechanism("fixed [A] = 6\nfixed [B] = 1\nA + 2X <=> 3X @ 1, 1\nX <=> B @ 11, k4\nk4 = 5");
    const result: ContinuationResult = continueEquilibria(mechanism, { target: { kind: "parameter", name: "k4" }, from: 5, to: 7 });
    const html = renderToString(createElement(BifurcationDiagram, { result, species: "X", xLabel: "k4" }));
    expect(html.match(/data-stable="(\w+)"/g)).toEqual(['data-stable="true"', 'data-stable="false"', 'data-stable="true"']);
    expect(html.match(/stroke-dasharray="7 5" data-stable/g)).toHaveLength(1);
    expect(html.match(/data-testid="bifurcation-marker"/g)).toHaveLength(2);
    expect(html).toMatch(/F1<\/strong> <!-- -->fold<!-- --> at <!-- -->k4<!-- --> = <span class="font-mono">6\.3849/);
  });
});
