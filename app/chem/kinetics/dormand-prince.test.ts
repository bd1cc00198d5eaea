import { describe, expect, it } from "vitest";
import { dormandPrince54 } from "./dormand-prince";

// The order conditions of explicit Runge–Kutta methods, one per rooted tree t:
// Σ_i b_i Φ_i(t) = 1/γ(t), with Φ_i(t) = Π over the subtrees t_k of t of Σ_j a_ij Φ_j(t_k) and
// γ(t) = |t|·Π γ(t_k) (J. C. Butcher; E. Hairer, S. P. Nørsett & G. Wanner, Solving Ordinary
// Differential Equations I, 2nd ed., Springer 1993, §II.2, Theorem 2.13 and Table 2.2).

/** A rooted tree as the list of its root's subtrees. */
type Tree = readonly Tree[];

const size = (tree: Tree): number => 1 + tree.reduce((sum, child) => sum + size(child), 0);
const density = (tree: Tree): number => size(tree) * tree.reduce((product, child) => product * density(child), 1);
const key = (tree: Tree): string => `(${tree.map(key).sort().join("")})`;

/** Every tree one vertex larger: a leaf grafted onto each vertex in turn. */
function grafts(tree: Tree): Tree[] {
  return [[...tree, []], ...tree.flatMap((child, i) => grafts(child).map((grown) => tree.map((other, j) => (j === i ? grown : other))))];
}

/** The rooted trees of each order 1 … maxOrder, without repeats. */
function treesByOrder(maxOrder: number): Tree[][] {
  const byOrder: Tree[][] = [[[]]];
  while (byOrder.length < maxOrder) {
    const unique = new Map(byOrder.at(-1)!.flatMap(grafts).map((tree) => [key(tree), tree]));
    byOrder.push([...unique.values()]);
  }
  return byOrder;
}

function elementaryWeights(tree: Tree, a: number[][]): number[] {
  const children = tree.map((child) => elementaryWeights(child, a));
  return a.map((row) => children.reduce((product, phi) => product * row.reduce((sum, aij, j) => sum + aij * phi[j], 0), 1));
}

/** The largest |Σ b_i Φ_i(t) − 1/γ(t)| over the trees of one order. */
function worstResidual(trees: Tree[], a: number[][], b: readonly number[]): number {
  return Math.max(...trees.map((tree) => Math.abs(elementaryWeights(tree, a).reduce((sum, phi, i) => sum + b[i] * phi, 0) - 1 / density(tree))));
}

/** The full s×s matrix: the listed rows, then the first-same-as-last stage, whose input is b's solution. */
function fullMatrix(): number[][] {
  const { a, b } = dormandPrince54;
  const s = b.length;
  return [[], ...a, b].map((row) => Array.from({ length: s }, (_, j) => row[j] ?? 0));
}

describe("Dormand–Prince 5(4) tableau", () => {
  const trees = treesByOrder(5);
  const a = fullMatrix();
  const b = dormandPrince54.b;
  const embedded = b.map((bi, i) => bi - dormandPrince54.e[i]);

  it("enumerates the 1, 1, 2, 4, 9 rooted trees of orders 1 to 5", () => {
    expect(trees.map((list) => list.length)).toEqual([1, 1, 2, 4, 9]);
  });

  it("meets the 17 conditions of order 5 with its propagated weights", () => {
    for (const list of trees) expect(worstResidual(list, a, b)).toBeLessThan(1e-14);
  });

  it("meets the 8 conditions of order 4 with its embedded weights, and not all of order 5", () => {
    for (const list of trees.slice(0, 4)) expect(worstResidual(list, a, embedded)).toBeLessThan(1e-14);
    expect(worstResidual(trees[4], a, embedded)).toBeGreaterThan(1e-4);
  });

  it("is first same as last, with its last two stages at the node c = 1 the stiffness test needs", () => {
    expect(b.at(-1)).toBe(0);
    const nodes = a.map((row) => row.reduce((sum, aij) => sum + aij, 0));
    expect(nodes.at(-2)).toBeCloseTo(1, 14);
    expect(nodes.at(-1)).toBeCloseTo(1, 14);
  });
});
