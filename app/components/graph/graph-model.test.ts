import { describe, expect, it } from "vitest";
import { analyzeSource } from "~/chem/analysis";
import { buildGraphModel, rateText } from "./graph-model";
import { edgeCurve } from "./edge-geometry";
import { distinctClassColours, linkageClassColours } from "./linkage-colours";

// X <=> 2X, X + Y -> 2Y, Y -> 0
const report = {
  complexes: ["X", "2X", "X + Y", "2Y", "Y", "0"],
  reactions: [
    { from: 0, to: 1, rate: 30, coefficient: "30" },
    { from: 1, to: 0, rate: 0.25, coefficient: "0.25" },
    { from: 2, to: 3, rate: null, coefficient: "k2" },
    { from: 4, to: 5, rate: 10 },
  ],
  linkageClasses: [
    [0, 1],
    [2, 3],
    [4, 5],
  ],
  terminalStrongLinkageClasses: [[0, 1], [3], [5]],
};

describe("graph model", () => {
  const model = buildGraphModel(report);

  it("has one node per complex keyed by its text, the zero complex drawn as ∅", () => {
    expect(model.nodes.map((node) => node.key)).toEqual(report.complexes);
    expect(model.nodes[5].label).toBe("∅");
    expect(model.nodes.map((node) => node.linkageClass)).toEqual([0, 0, 1, 1, 2, 2]);
    expect(model.nodes.map((node) => node.terminal)).toEqual([true, true, false, true, false, true]);
  });

  it("bends both reactions of a reversible pair and no other", () => {
    expect(model.edges.map((edge) => edge.bend)).toEqual([1, 1, 0, 0]);
    expect(new Set(model.edges.map((edge) => edge.id)).size).toBe(4);
    expect(model.edges[2]).toMatchObject({ source: "X + Y", target: "2Y", label: "k2", index: 2 });
    expect(model.edges[3].label).toBe("10");
  });

  it("describes complexes and reactions in words for screen readers", () => {
    expect(model.nodes[5].description).toBe("Complex ∅, linkage class 3, terminal");
    expect(model.nodes[2].description).toBe("Complex X + Y, linkage class 2");
    expect(model.edges[2].description).toBe("Reaction X + Y to 2Y, rate coefficient k2");
  });
});

describe("rate labels", () => {
  it("stay short and read as the typeset equations do (a×10ⁿ, never e-notation)", () => {
    expect(rateText(0.25)).toBe("0.25");
    expect(rateText(30)).toBe("30");
    expect(rateText(1 / 3)).toBe("0.333");
    expect(rateText(1e-4)).toBe("10⁻⁴");
    expect(rateText(2.5e6)).toBe("2.5×10⁶");
    expect(rateText(1.2e9)).toBe("1.2×10⁹");
    expect(rateText(1.23456e17)).toBe("1.23×10¹⁷");
    expect(rateText(0)).toBe("0");
  });
});

describe("reaction curves", () => {
  const left = { x: 0, y: 0, width: 60, height: 40 };
  const right = { x: 200, y: 0, width: 60, height: 40 };

  it("draw a reversible pair on opposite sides of the line between the boxes", () => {
    const forward = edgeCurve(left, right, 1);
    const backward = edgeCurve(right, left, 1);
    expect(Math.sign(forward.middle.y - 20)).toBe(-Math.sign(backward.middle.y - 20));
    expect(Math.abs(forward.middle.y - 20)).toBeGreaterThan(5);
  });

  it("run straight between the box borders when unbent", () => {
    const straight = edgeCurve(left, right, 0);
    expect(straight.start).toEqual({ x: 60, y: 20 });
    expect(straight.end.x).toBeCloseTo(197);
    expect(straight.middle.y).toBeCloseTo(20);
  });
});

describe("linkage class colours", () => {
  it("differ, tint or rim, for every class of a large network", () => {
    expect(distinctClassColours).toBeGreaterThanOrEqual(90);
    const looks = Array.from({ length: distinctClassColours }, (_, index) => linkageClassColours(index)).map(({ base, rim }) => `${base} ${rim}`);
    expect(new Set(looks).size).toBe(distinctClassColours);
    // Once the hues come round, the rim changes first.
    expect([0, 10, 20].map((index) => linkageClassColours(index).rim)).toEqual(["solid", "dashed", "dotted"]);
  });

  it("mix with the theme so they follow light and dark", () => {
    const { fill, outline } = linkageClassColours(0);
    expect(fill).toContain("var(--mw-raised)");
    expect(outline).toContain("var(--mw-ink)");
  });
});

describe("graph of a mechanism with a rate coefficient of 0", () => {
  it("draws only what runs: the step is absent, and so is a complex no other reaction uses", async () => {
    const model = buildGraphModel(await analyzeSource("A -> B @ 0\nB <=> C @ 1, k\nk = 0"));
    expect(model.nodes.map((node) => node.key)).toEqual(["B", "C"]);
    expect(model.edges.map((edge) => [edge.source, edge.target])).toEqual([["B", "C"]]);
  });
});
