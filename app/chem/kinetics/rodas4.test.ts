import { describe, expect, it } from "vitest";
import { rodas4 } from "./rodas4";

// The order conditions of Rosenbrock methods up to order 4 in E. Hairer & G. Wanner, Solving
// Ordinary Differential Equations II, 2nd ed., Springer 1996, §IV.7, Table 7.1. They are stated
// for the original coefficients α_ij, γ_ij, b_i; the tableau holds the transformed ones, and the
// same section gives the way back: Γ⁻¹ = diag(1/γ) − C, α = A·Γ, b = m·Γ.
// Sums run over all indices; α_i = Σ_j α_ij, β_ij = α_ij + γ_ij below the diagonal (0 on and
// above it), β'_i = Σ_j β_ij.

const s = rodas4.m.length;
const gamma = rodas4.gamma;

/** A strictly lower triangular s×s matrix from rows for stages 1 … s − 1. */
const lower = (rows: readonly (readonly number[])[]): number[][] =>
  Array.from({ length: s }, (_, i) => Array.from({ length: s }, (_, j) => (i > 0 && j < i ? (rows[i - 1][j] ?? 0) : 0)));

const times = (p: number[][], q: number[][]): number[][] => p.map((row) => q[0].map((_, j) => row.reduce((sum, pik, k) => sum + pik * q[k][j], 0)));
const rowTimes = (v: readonly number[], q: number[][]): number[] => q[0].map((_, j) => v.reduce((sum, vk, k) => sum + vk * q[k][j], 0));

/** Inverse of a lower triangular matrix by forward substitution, column by column. */
function inverseLower(l: number[][]): number[][] {
  const inverse = l.map((row) => row.map(() => 0));
  for (let col = 0; col < s; col++) {
    for (let i = col; i < s; i++) {
      let sum = i === col ? 1 : 0;
      for (let k = col; k < i; k++) sum -= l[i][k] * inverse[k][col];
      inverse[i][col] = sum / l[i][i];
    }
  }
  return inverse;
}

const c = lower(rodas4.c);
const gammaInverse = c.map((row, i) => row.map((cij, j) => (i === j ? 1 / gamma : 0) - cij));
const bigGamma = inverseLower(gammaInverse);
const alpha = times(lower(rodas4.a), bigGamma);
const beta = alpha.map((row, i) => row.map((aij, j) => (j < i ? aij + bigGamma[i][j] : 0)));
const alphaSum = alpha.map((row) => row.reduce((sum, x) => sum + x, 0));
const betaSum = beta.map((row) => row.reduce((sum, x) => sum + x, 0));

const sum = (f: (i: number) => number): number => Array.from({ length: s }, (_, i) => f(i)).reduce((total, x) => total + x, 0);

/** Residuals of Table 7.1's conditions, by order. */
function residuals(b: number[]): number[][] {
  return [
    [sum((i) => b[i]) - 1],
    [sum((i) => b[i] * betaSum[i]) - (1 / 2 - gamma)],
    [
      sum((i) => b[i] * alphaSum[i] ** 2) - 1 / 3,
      sum((i) => b[i] * sum((j) => beta[i][j] * betaSum[j])) - (1 / 6 - gamma + gamma ** 2),
    ],
    [
      sum((i) => b[i] * alphaSum[i] ** 3) - 1 / 4,
      sum((i) => b[i] * alphaSum[i] * sum((j) => alpha[i][j] * betaSum[j])) - (1 / 8 - gamma / 3),
      sum((i) => b[i] * sum((j) => beta[i][j] * alphaSum[j] ** 2)) - (1 / 12 - gamma / 3),
      sum((i) => b[i] * sum((j) => beta[i][j] * sum((k) => beta[j][k] * betaSum[k]))) - (1 / 24 - gamma / 2 + (3 / 2) * gamma ** 2 - gamma ** 3),
    ],
  ];
}

const worst = (list: number[]): number => Math.max(...list.map(Math.abs));

describe("RODAS4 tableau", () => {
  const b = rowTimes(rodas4.m, bigGamma);
  const embedded = rowTimes(
    rodas4.m.map((mi, i) => mi - rodas4.e[i]),
    bigGamma,
  );

  it("meets the 8 conditions of order 4 with its propagated weights", () => {
    for (const byOrder of residuals(b)) expect(worst(byOrder)).toBeLessThan(1e-12);
  });

  it("meets the 4 conditions of order 3 with its embedded weights, and not all of order 4", () => {
    const [first, second, third, fourth] = residuals(embedded);
    for (const byOrder of [first, second, third]) expect(worst(byOrder)).toBeLessThan(1e-12);
    expect(worst(fourth)).toBeGreaterThan(1e-4);
  });

  it("is stiffly accurate: both solutions are stage inputs, so b is the last row of α + Γ", () => {
    const last = alpha[s - 1].map((aij, j) => aij + bigGamma[s - 1][j]);
    last.forEach((value, j) => expect(value).toBeCloseTo(b[j], 12));
  });
});
