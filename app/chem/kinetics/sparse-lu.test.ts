// The sparse shifted LU against the dense one (partial pivoting, an independent elimination), and
// the sharing of its symbolic factorisation: solvers built on one pattern must not share numbers.
import { describe, expect, it } from "vitest";
import { seededRandom } from "~/chem/seeded-random";
import { DenseLu } from "./dense-lu";
import { SparseShiftedLu } from "./sparse-lu";

/** A random sparse pattern with its diagonal, and a Jacobian with values on exactly that pattern. */
function randomSystem(n: number, perRow: number, seed: number) {
  const random = seededRandom(seed);
  const pattern = Array.from({ length: n }, (_, i) => [...new Set([i, ...Array.from({ length: perRow }, () => Math.floor(random() * n))])].sort((a, b) => a - b));
  const jacobian = new Float64Array(n * n);
  pattern.forEach((row, i) => row.forEach((j) => (jacobian[i * n + j] = random() * 2 - 1 - (i === j ? 3 : 0))));
  return { pattern, jacobian };
}

function denseSolution(n: number, shift: number, jacobian: Float64Array, b: Float64Array): Float64Array {
  const lu = new DenseLu(n);
  expect(lu.factorShifted(shift, jacobian)).toBe(true);
  const x = Float64Array.from(b);
  lu.solve(x);
  return x;
}

describe("SparseShiftedLu", () => {
  it("solves (s·I − J)·x = b as dense partial pivoting does, for two solvers sharing one pattern", () => {
    const n = 60;
    const { pattern, jacobian } = randomSystem(n, 3, 7);
    const b = Float64Array.from({ length: n }, (_, i) => Math.sin(i + 1));
    const first = new SparseShiftedLu(pattern);
    const second = new SparseShiftedLu(pattern);
    expect(first.factor(2, jacobian)).toBe(true);
    expect(second.factor(50, jacobian)).toBe(true);
    // Solving with the first after the second factored: each keeps its own numbers.
    for (const [solver, shift] of [[first, 2], [second, 50]] as const) {
      const x = Float64Array.from(b);
      solver.solve(x);
      const expected = denseSolution(n, shift, jacobian, b);
      x.forEach((value, i) => expect(value).toBeCloseTo(expected[i], 12));
    }
  });
});
