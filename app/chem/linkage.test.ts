import { describe, expect, it } from "vitest";
import { analyzeLinkage } from "./linkage";

describe("analyzeLinkage", () => {
  it("finds linkage, strong and terminal classes of Michaelis–Menten (E+S ⇌ C → E+P)", () => {
    // Complexes 0 = E + S, 1 = C, 2 = E + P.
    const linkage = analyzeLinkage(3, [
      { from: 0, to: 1 },
      { from: 1, to: 0 },
      { from: 1, to: 2 },
    ]);
    expect(linkage.linkageClasses).toEqual([[0, 1, 2]]);
    expect(linkage.strongLinkageClasses).toEqual([[0, 1], [2]]);
    expect(linkage.terminalStrongLinkageClasses).toEqual([[2]]);
  });

  it("separates disconnected parts and lists classes by smallest complex", () => {
    const linkage = analyzeLinkage(5, [
      { from: 3, to: 4 },
      { from: 0, to: 2 },
      { from: 2, to: 0 },
      { from: 1, to: 3 },
    ]);
    expect(linkage.linkageClasses).toEqual([[0, 2], [1, 3, 4]]);
    expect(linkage.linkageClassOf).toEqual([0, 1, 0, 1, 1]);
    expect(linkage.strongLinkageClasses).toEqual([[0, 2], [1], [3], [4]]);
    expect(linkage.terminalStrongLinkageClasses).toEqual([[0, 2], [4]]);
  });

  it("handles a chain of 100,000 complexes without overflowing the stack", () => {
    const count = 100_000;
    const edges = Array.from({ length: count - 1 }, (_, i) => ({ from: i, to: i + 1 }));
    edges.push({ from: count - 1, to: 0 });
    const linkage = analyzeLinkage(count, edges);
    expect(linkage.strongLinkageClasses).toHaveLength(1);
    expect(linkage.terminalStrongLinkageClasses).toHaveLength(1);
  });
});
