import { describe, expect, it } from "vitest";
import { analyzeMechanism, analyzeSource } from "./analysis";
import { ShapeMemo, shapeKey } from "./network-shape";
import { buildNetwork } from "./network";
import { parseMechanism } from "./parse";

const networkOf = (source: string) => buildNetwork(parseMechanism(source).mechanism);

describe("the network's shape", () => {
  it("is the same for texts that differ only in coefficients, labels, comments and initial values", () => {
    const a = networkOf("r1: A + B -> C @ 1\nC -> A + B @ k\nk = 2\n");
    const b = networkOf("# lab notes\nfast: A + B -> C @ 3.5e9\nC -> A + B @ 7\n[A]0 = 1\n");
    expect(shapeKey(a)).toBe(shapeKey(b));
  });

  it("changes with a complex, a reaction, a species or a custom rate law", () => {
    const base = shapeKey(networkOf("A + B -> C @ 1\n"));
    for (const other of ["A + B -> D @ 1\n", "A + B -> C @ 1\nC -> A @ 1\n", "A + 2 B -> C @ 1\n", "A + B -> C @ { 2*A*B }\n"]) {
      expect(shapeKey(networkOf(other))).not.toBe(base);
    }
  });
});

describe("ShapeMemo", () => {
  it("gives every report of a changing text exactly what a fresh analysis gives", async () => {
    const shapes = new ShapeMemo();
    // Bistable Schlögl-type scheme, typed coefficient by coefficient, then a step more.
    const texts = [
      "A + 2 X -> 3 X @ 1\n3 X -> A + 2 X @ 1\nX -> B @ 1\nB -> X @ 1\n",
      "A + 2 X -> 3 X @ 2.5\n3 X -> A + 2 X @ 1\nX -> B @ 1\nB -> X @ 1\n",
      "A + 2 X -> 3 X @ 2.5\n3 X -> A + 2 X @ 1\nX -> B @ 0.1\nB -> X @ 1\n",
      "A + 2 X -> 3 X @ 2.5\n3 X -> A + 2 X @ 1\nX -> B @ 0.1\nB -> X @ 1\nB -> @ 1\n",
    ];
    for (const text of texts) {
      expect(await analyzeMechanism(parseMechanism(text), { shapes })).toEqual(await analyzeSource(text));
    }
  });

  it("computes a shape once while only coefficients change, and again when the shape changes", async () => {
    const shapes = new ShapeMemo();
    const first = await shapes.get(networkOf("A -> B @ 1\nB -> A @ 2\n"));
    expect(await shapes.get(networkOf("A -> B @ 5\nB -> A @ 0.5\n"))).toBe(first);
    expect(await shapes.get(networkOf("A -> B @ 5\nB -> C @ 0.5\n"))).not.toBe(first);
  });

  it("keeps only the most recent shapes", async () => {
    const shapes = new ShapeMemo(2);
    const first = await shapes.get(networkOf("A -> B @ 1\n"));
    await shapes.get(networkOf("A -> C @ 1\n"));
    await shapes.get(networkOf("A -> D @ 1\n"));
    expect(await shapes.get(networkOf("A -> B @ 1\n"))).not.toBe(first);
  });
});
