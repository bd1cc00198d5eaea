import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { buildNetwork } from "~/chem/network";
import { parseMechanism } from "~/chem/parse";
import { brusselator, lotkaVolterra, massAction } from "../../../tests/fixtures/dynamics/models";
import { conservationBasis } from "./conservation";
import { networkEquilibrium, polynomialEquilibrium } from "./equilibrium";
import { SimulationInputError } from "./errors";

describe("equilibria", () => {
  it("A ⇌ B ⇌ C settles at the detailed-balance solution, stable within its class", () => {
    // Deficiency zero and reversible: the unique positive equilibrium of the class satisfies
    // detailed balance, B/A = k1/k-1 and C/B = k2/k-2 (Horn & Jackson 1972; Feinberg 1987).
    const { mechanism, network } = massAction(
      ["A", "B", "C"],
      [
        [{ A: 1 }, { B: 1 }, 2],
        [{ B: 1 }, { A: 1 }, 1],
        [{ B: 1 }, { C: 1 }, 3],
        [{ C: 1 }, { B: 1 }, 0.5],
      ],
      { A: 1 },
    );
    const a = 1 / (1 + 2 + 12);
    for (const start of [undefined, [0.5, 0.3, 0.2]]) {
      const result = networkEquilibrium(mechanism, network, { start });
      expect(result.converged).toBe(true);
      expect(result.state.A).toBeCloseTo(a, 10);
      expect(result.state.B).toBeCloseTo(2 * a, 10);
      expect(result.state.C).toBeCloseTo(12 * a, 10);
      expect(result.stability).toBe("stable");
      expect(result.eigenvalues).toHaveLength(2);
      expect(result.summary).toMatch(/positive equilibrium.*stable/);
    }
  });

  it("the conservation basis of Michaelis–Menten holds E + C and S + C + P", () => {
    // Columns: E + S → C, C → E + S, C → E + P over species E, S, C, P.
    const { laws } = conservationBasis([
      [-1, 1, 1],
      [-1, 1, 0],
      [1, -1, -1],
      [0, 0, 1],
    ]);
    expect(laws).toHaveLength(2);
    const stoichiometry = [[-1, -1, 1, 0], [1, 1, -1, 0], [1, 0, -1, 1]];
    for (const law of laws) for (const column of stoichiometry) expect(law.reduce((s, w, i) => s + w * column[i], 0)).toBeCloseTo(0, 12);
  });

  it("keeps the law 3x + y of an ODE written in thirds, which its doubles only approximate", () => {
    // x' = −x/3 + y, y' = x − 3y: 3x' + y' = 0, so 3x + y = 3 from (1, 0), and y = x/3 at rest:
    // x = 0.9, y = 0.3; within the class the Jacobian's eigenvalue is its trace, −1/3 − 3 = −10/3.
    const ode = {
      variables: ["x", "y"],
      rhs: [
        [{ coefficient: -1 / 3, exponents: [1, 0] }, { coefficient: 1, exponents: [0, 1] }],
        [{ coefficient: 1, exponents: [1, 0] }, { coefficient: -3, exponents: [0, 1] }],
      ],
      initial: [1, 0],
    };
    const result = polynomialEquilibrium(ode, { start: [0.5, 0.5] });
    expect(result.converged).toBe(true);
    expect(result.state.x).toBeCloseTo(0.9, 12);
    expect(result.state.y).toBeCloseTo(0.3, 12);
    expect(result.eigenvalues).toEqual([{ re: expect.closeTo(-10 / 3, 10), im: 0 }]);
    expect(result.stability).toBe("stable");
  });

  it("refuses a coefficient beyond the doubles (10^400 in an ODE text) with a clear message", () => {
    const ode = { variables: ["x"], rhs: [[{ coefficient: Infinity, exponents: [1] }]], initial: [1] };
    expect(() => polynomialEquilibrium(ode, { start: [1] })).toThrow(SimulationInputError);
  });

  it("the Brusselator's equilibrium (1, 3) is unstable: b = 3 > 1 + a² (Prigogine & Lefever 1968)", () => {
    const result = polynomialEquilibrium(brusselator(), { start: [1.2, 2.5] });
    expect(result.state.x).toBeCloseTo(1, 10);
    expect(result.state.y).toBeCloseTo(3, 10);
    expect(result.stability).toBe("unstable");
    expect(result.summary).toMatch(/unstable.*oscillat/);
  });

  it("Lotka–Volterra's centre (1, 1) is left undecided by linearisation", () => {
    const result = polynomialEquilibrium(lotkaVolterra(), { start: [0.9, 1.2] });
    expect(result.state.x).toBeCloseTo(1, 10);
    expect(result.stability).toBe("undecided");
    expect(result.eigenvalues.map((e) => Math.abs(e.im))).toEqual([expect.closeTo(1, 8), expect.closeTo(1, 8)]);
  });

  it("Schlögl's bistable network has two stable equilibria and an unstable one between them", () => {
    // Schlögl's second model (Z. Physik 253 (1972) 147), A + 2X ⇌ 3X, B ⇌ X, with [A] and [B]
    // held and folded into the coefficients: x' = 6x² − x³ + 6 − 11x = −(x − 1)(x − 2)(x − 3).
    // Hand-worked: roots 1, 2, 3; f'(x) = −3x² + 12x − 11 is −2, 1, −2 there.
    const { mechanism, network } = massAction(
      ["X"],
      [
        [{ X: 2 }, { X: 3 }, 6],
        [{ X: 3 }, { X: 2 }, 1],
        [{}, { X: 1 }, 6],
        [{ X: 1 }, {}, 11],
      ],
      { X: 0.5 },
    );
    const result = networkEquilibrium(mechanism, network);
    const found = [...result.equilibria].sort((a, b) => a.state.X - b.state.X);
    expect(found.map((e) => e.state.X)).toEqual([expect.closeTo(1, 10), expect.closeTo(2, 10), expect.closeTo(3, 10)]);
    expect(found.map((e) => e.stability)).toEqual(["stable", "unstable", "stable"]);
    expect(found.map((e) => e.eigenvalues[0].re)).toEqual([expect.closeTo(-2, 8), expect.closeTo(1, 8), expect.closeTo(-2, 8)]);
    // From X = 0.5 the simulation settles at the lower stable state, which the top-level fields keep.
    expect(result.state.X).toBeCloseTo(1, 10);
    expect(result.summary).toMatch(/^3 distinct equilibria.*2 stable, 1 unstable/);
    expect(result.classDimension).toBe(1);
  });

  it("finds all three equilibria of the realized Lorenz mechanism, though its simulation gives up", () => {
    // The mechanism is our realization of Lorenz's x' = 10(y − x), y' = x(28 − z) − y,
    // z' = xy − 8z/3 shifted by (21, 28, 3.8) and multiplied by xyz. Lorenz (J. Atmos. Sci. 20
    // (1963) 130) gives the equilibria (0, 0, 0) and (±√(β(ρ−1)), ±√(β(ρ−1)), ρ − 1) = (±√72, ±√72, 27).
    const { mechanism } = parseMechanism(readFileSync("tests/fixtures/lorenz-realized.weave", "utf8"));
    const result = networkEquilibrium(mechanism, buildNetwork(mechanism));
    const positive = result.equilibria.filter((e) => e.positive).sort((a, b) => a.state.x - b.state.x);
    const r = Math.sqrt(72);
    const expected = [
      [21 - r, 28 - r, 30.8],
      [21, 28, 3.8],
      [21 + r, 28 + r, 30.8],
    ];
    expect(positive).toHaveLength(3);
    positive.forEach((e, k) => {
      expect([e.state.x, e.state.y, e.state.z]).toEqual(expected[k].map((v) => expect.closeTo(v, 8)));
      // With ρ = 28 > 24.74 all three are unstable (Lorenz 1963), and multiplying by the positive xyz keeps the signs.
      expect(e.stability).toBe("unstable");
    });
    expect(result.converged).toBe(true);
  });
});
