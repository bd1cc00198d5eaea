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
