import dagre from "@dagrejs/dagre";
import { describe, expect, it } from "vitest";
import { estimateNodeSize, placeComplexes, type Size, type XY } from "./layout";

const sizeOf = (key: string): Size => estimateNodeSize(key);

function overlaps(a: XY, sa: Size, b: XY, sb: Size) {
  return a.x < b.x + sb.width && b.x < a.x + sa.width && a.y < b.y + sb.height && b.y < a.y + sa.height;
}

// X + Y <=> 2Y -> Z ; A <=> B : two linkage classes.
const keys = ["X + Y", "2Y", "Z", "A", "B"];
const reactions = [
  { from: 0, to: 1 },
  { from: 1, to: 0 },
  { from: 1, to: 2 },
  { from: 3, to: 4 },
  { from: 4, to: 3 },
];
const linkageClasses = [
  [0, 1, 2],
  [3, 4],
];

describe("placing complexes", () => {
  it("places a class of two complexes where dagre itself would, in either direction and at any sizes", () => {
    const sizes: Record<string, Size> = {};
    for (let trial = 0; trial < 40; trial++) {
      // Varied widths and heights (labels are one line high in the app, but the rule must not depend on it).
      const [a, b] = [`A${trial}`, `B${trial}`];
      sizes[a] = { width: 52 + ((trial * 37) % 240), height: 39 + ((trial * 7) % 3) * 6 };
      sizes[b] = { width: 52 + ((trial * 53) % 180), height: 39 + ((trial * 11) % 4) * 5 };
      // The first reaction listed sets the direction; its reverse (a reversible pair) changes nothing.
      const reactions = trial % 2 === 0 ? [{ from: 0, to: 1 }] : [{ from: 1, to: 0 }, { from: 0, to: 1 }];
      const placed = placeComplexes({ keys: [a, b], reactions, linkageClasses: [[0, 1]], known: {}, sizeOf: (key) => sizes[key] });

      const graph = new dagre.graphlib.Graph();
      graph.setGraph({ rankdir: "LR", nodesep: 28, ranksep: 72, marginx: 0, marginy: 0 });
      graph.setDefaultEdgeLabel(() => ({}));
      for (const key of [a, b]) graph.setNode(key, { ...sizes[key] });
      const [from, to] = trial % 2 === 0 ? [a, b] : [b, a];
      graph.setEdge(from, to);
      dagre.layout(graph);
      const corner = (key: string) => ({ x: Math.round(graph.node(key).x - sizes[key].width / 2), y: Math.round(graph.node(key).y - sizes[key].height / 2) });
      const top = Math.min(corner(a).y, corner(b).y);
      expect(placed).toEqual({ [a]: { x: corner(a).x, y: corner(a).y - top }, [b]: { x: corner(b).x, y: corner(b).y - top } });
    }
  });

  it("lays each linkage class out left to right and shelves the classes in rows", () => {
    const placed = placeComplexes({ keys, reactions, linkageClasses, known: {}, sizeOf });
    expect(Object.keys(placed).sort()).toEqual([...keys].sort());
    expect(placed["X + Y"].x).toBeLessThan(placed["2Y"].x);
    expect(placed["2Y"].x).toBeLessThan(placed["Z"].x);
    const firstBottom = Math.max(...["X + Y", "2Y", "Z"].map((key) => placed[key].y + sizeOf(key).height));
    expect(Math.min(placed.A.y, placed.B.y)).toBeGreaterThan(firstBottom);
    expect(placed["X + Y"].x).toBe(0);
  });

  it("gives no two complexes overlapping places", () => {
    const placed = placeComplexes({ keys, reactions, linkageClasses, known: { Z: { x: 10, y: 10 } }, sizeOf });
    const all: Record<string, XY> = { ...placed, Z: { x: 10, y: 10 } };
    for (const a of keys) for (const b of keys) if (a < b) expect(overlaps(all[a], sizeOf(a), all[b], sizeOf(b))).toBe(false);
  });

  it("never moves known positions and places only what is missing", () => {
    const known = { "X + Y": { x: 500, y: 300 }, "2Y": { x: 650, y: 300 }, A: { x: 0, y: 0 }, B: { x: 150, y: 0 } };
    const placed = placeComplexes({ keys, reactions, linkageClasses, known, sizeOf });
    expect(Object.keys(placed)).toEqual(["Z"]);
    // The new complex joins its class, to the right of the complex it comes from.
    expect(placed.Z.x).toBeGreaterThan(650);
    expect(Math.abs(placed.Z.y - 300)).toBeLessThan(120);
  });

  it("attaches a new complex to its own neighbour, wherever co-authors dragged the class", () => {
    // A triangle dragged into a wide shape; a new complex hangs off its left corner only.
    const triangle = ["A", "B", "C", "D"];
    const known = { A: { x: 0, y: 0 }, B: { x: 400, y: 0 }, C: { x: 200, y: 300 } };
    const placed = placeComplexes({
      keys: triangle,
      reactions: [
        { from: 0, to: 1 },
        { from: 1, to: 2 },
        { from: 2, to: 0 },
        { from: 0, to: 3 },
      ],
      linkageClasses: [[0, 1, 2, 3]],
      known,
      sizeOf,
    });
    expect(Object.keys(placed)).toEqual(["D"]);
    expect(Math.hypot(placed.D.x - known.A.x, placed.D.y - known.A.y)).toBeLessThan(260);
  });

  it("keeps a new complex off the arrows already drawn", () => {
    // X and Z in one row with an arrow between; Y hangs off X and dagre would put it on that arrow.
    const known = { X: { x: 0, y: 0 }, Z: { x: 300, y: 0 } };
    const size = { width: 52, height: 38 };
    const placed = placeComplexes({
      keys: ["X", "Z", "Y"],
      reactions: [
        { from: 0, to: 1 },
        { from: 0, to: 2 },
      ],
      linkageClasses: [[0, 1, 2]],
      known,
      sizeOf: () => size,
    });
    const arrowY = size.height / 2;
    expect(placed.Y.y > arrowY || placed.Y.y + size.height < arrowY).toBe(true);
  });

  it("puts a new linkage class below everything already drawn", () => {
    const known = { "X + Y": { x: 40, y: 20 }, "2Y": { x: 200, y: 20 }, Z: { x: 360, y: 20 } };
    const placed = placeComplexes({ keys, reactions, linkageClasses, known, sizeOf });
    expect(Object.keys(placed).sort()).toEqual(["A", "B"]);
    expect(Math.min(placed.A.y, placed.B.y)).toBeGreaterThan(20 + sizeOf("Z").height);
    expect(Math.min(placed.A.x, placed.B.x)).toBe(40);
  });

  it("places a complex that no linkage class lists", () => {
    const placed = placeComplexes({ keys: ["P", "Q"], reactions: [{ from: 0, to: 1 }], linkageClasses: [], known: {}, sizeOf });
    expect(Object.keys(placed).sort()).toEqual(["P", "Q"]);
  });
});
