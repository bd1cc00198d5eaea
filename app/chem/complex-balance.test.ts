import { describe, expect, it } from "vitest";
import { analyzeSource } from "./analysis";
import { complexBalance } from "./complex-balance";
import { buildNetwork } from "./network";
import { parseMechanism } from "./parse";

async function balanceOf(text: string) {
  const report = await analyzeSource(text);
  return { report, balance: complexBalance(buildNetwork(parseMechanism(text).mechanism), report) };
}

// A cycle A → B → C → A beside 2A ⇌ 2B: weakly reversible, not reversible, deficiency 1.
// Worked by hand from the definition: balance at every complex needs k1·a = k2·b = k3·c and
// k4·a² = k5·b², so (k1/k2)² = k4/k5, i.e. k1²·k5 = k2²·k4. In tree constants K(A) = k2·k3,
// K(B) = k3·k1, K(2A) = k5, K(2B) = k4 that is K(2A)·K(B)² = K(2B)·K(A)².
const cycle = (k4: number) => `A -> B @ 2\nB -> C @ 1\nC -> A @ 1\n2A <=> 2B @ ${k4}, 1\n`;

describe("complex balance for given coefficients", () => {
  it("states the one condition of a deficiency-one cycle and finds it satisfied when k1²·k5 = k2²·k4", async () => {
    const { report, balance } = await balanceOf(cycle(4));
    expect(report.deficiency).toBe(1);
    expect(report.reversible).toBe(false);
    expect(balance.applicable).toBe(true);
    expect(balance.conditions).toHaveLength(1);
    const [{ text }] = balance.conditions;
    // The basis vector's sign is the kernel's choice: either side may come first.
    expect(["K(B)^2*K(2A) = K(A)^2*K(2B)", "K(A)^2*K(2B) = K(B)^2*K(2A)"]).toContain(text);
    expect(balance.treeConstants).toEqual([1, 2, 2, 1, 4]);
    expect(balance.satisfied).toBe(true);
  });

  it("and not satisfied when they differ", async () => {
    const { balance } = await balanceOf(cycle(3));
    expect(balance.satisfied).toBe(false);
    expect(balance.conditions[0].satisfied).toBe(false);
  });

  it("deficiency 0 and weakly reversible: no condition, always complex balanced", async () => {
    const { balance } = await balanceOf("A -> B @ 1\nB -> C @ 2\nC -> A @ 3\n");
    expect(balance).toMatchObject({ applicable: true, conditions: [], satisfied: true });
    expect(balance.note).toMatch(/Horn/);
  });

  it("not weakly reversible: not applicable, said why", async () => {
    const { balance } = await balanceOf("E + S <=> C @ 1, 1\nC -> E + P @ 1\n");
    expect(balance.applicable).toBe(false);
    expect(balance.note).toMatch(/weakly reversible/);
  });
});
