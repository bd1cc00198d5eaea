import { describe, expect, it } from "vitest";
import { massAction } from "../../../tests/fixtures/dynamics/models";
import { networkSpec } from "./from-network";
import { compileKineticSystem } from "./kinetic-system";

describe("compiled kinetic systems", () => {
  const { mechanism, network } = massAction(
    ["X", "Y", "Z"],
    [
      [{ X: 2, Y: 1 }, { Z: 1 }, 3],
      [{ Z: 1 }, { X: 1 }, 0.5],
      [{}, { Y: 1 }, 1.5],
      [{ Y: 3 }, {}, 0.25],
    ],
    {},
  );
  const spec = networkSpec(mechanism, network);
  const y = Float64Array.of(0.7, 1.3, 0.4);

  it("generated code and the table-driven fallback agree on f and ∂f/∂y", () => {
    const generated = compileKineticSystem(spec);
    const table = compileKineticSystem(spec, { generate: false });
    expect(generated.generated).toBe(true);
    expect(table.generated).toBe(false);
    const [f1, f2] = [new Float64Array(3), new Float64Array(3)];
    generated.rhs(y, f1);
    table.rhs(y, f2);
    expect([...f1]).toEqual([...f2]);
    const [j1, j2] = [new Float64Array(9), new Float64Array(9)];
    generated.jacobian(y, j1);
    table.jacobian(y, j2);
    for (let i = 0; i < 9; i++) expect(j1[i]).toBeCloseTo(j2[i], 12);
  });

  it("the analytic Jacobian matches central differences, custom laws included", () => {
    const withLaw = structuredClone(network);
    withLaw.reactions[1] = { ...withLaw.reactions[1], rate: null, law: "0.5 * Z^2 / (1 + X)" };
    for (const system of [compileKineticSystem(spec), compileKineticSystem(networkSpec(mechanism, withLaw))]) {
      const analytic = new Float64Array(9);
      system.jacobian(y, analytic);
      for (let j = 0; j < 3; j++) {
        const [up, down] = [Float64Array.from(y), Float64Array.from(y)];
        up[j] += 1e-6;
        down[j] -= 1e-6;
        const [fu, fd] = [new Float64Array(3), new Float64Array(3)];
        system.rhs(up, fu);
        system.rhs(down, fd);
        for (let i = 0; i < 3; i++) expect(analytic[i * 3 + j]).toBeCloseTo((fu[i] - fd[i]) / 2e-6, 5);
      }
    }
  });
});

describe("sparse factorisation of the Rosenbrock matrix", () => {
  it("solves like dense partial pivoting on a generated network's Jacobian", async () => {
    const { generatedNetwork } = await import("../../../tests/fixtures/dynamics/models");
    const { SparseShiftedLu } = await import("./sparse-lu");
    const { DenseLu } = await import("./dense-lu");
    const { mechanism, network: generated } = generatedNetwork(60, { seed: 7 });
    const system = compileKineticSystem(networkSpec(mechanism, generated));
    const n = system.names.length;
    const jacobian = new Float64Array(n * n);
    system.jacobian(system.initial, jacobian);
    const sparse = new SparseShiftedLu(system.sparsity as number[][]);
    const dense = new DenseLu(n);
    expect(sparse.factor(3, jacobian)).toBe(true);
    expect(dense.factorShifted(3, jacobian)).toBe(true);
    const b = Float64Array.from({ length: n }, (_, i) => Math.sin(i + 1));
    const [x1, x2] = [Float64Array.from(b), Float64Array.from(b)];
    sparse.solve(x1);
    dense.solve(x2);
    for (let i = 0; i < n; i++) expect(x1[i]).toBeCloseTo(x2[i], 10);
  });
});
