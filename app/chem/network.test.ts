import { describe, expect, it } from "vitest";
import { buildNetwork, reactionVector } from "./network";
import { parseMechanism } from "./parse";

const network = (source: string) => buildNetwork(parseMechanism(source).mechanism);

describe("buildNetwork", () => {
  it("writes complexes canonically (terms in species order), in order of first appearance", () => {
    const { complexes } = network('X + Y -> 2Y @ 1\nY + X + X -> 0 @ 1\n"Fe3+" -> X @ 1');
    expect(complexes.map((c) => c.text)).toEqual(["X + Y", "2Y", "2X + Y", "0", '"Fe3+"', "X"]);
    expect(complexes[2].terms).toEqual([{ species: 0, coefficient: 2 }, { species: 1, coefficient: 1 }]);
  });

  it("gives two reactions for a reversible step", () => {
    const { reactions } = network("A <=> B @ 2, 3");
    expect(reactions.map(({ from, to, rate }) => ({ from, to, rate }))).toEqual([
      { from: 0, to: 1, rate: 2 },
      { from: 1, to: 0, rate: 3 },
    ]);
  });

  it("merges duplicate steps and adds their rates", () => {
    const { reactions } = network("A -> B @ k1\nA <=> B @ 2, 3\nk1 = 1");
    expect(reactions.map(({ from, to, rate, steps }) => ({ from, to, rate, steps }))).toEqual([
      { from: 0, to: 1, rate: 3, steps: [0, 1] },
      { from: 1, to: 0, rate: 3, steps: [1] },
    ]);
    expect(reactions[0].coefficient).toEqual([
      [{ kind: "parameter", symbol: "k1", power: 1 }],
      [{ kind: "value", symbol: "2", power: 1 }],
    ]);
  });

  it("drops fixed species from complexes and folds concentration^coefficient into the rate", () => {
    const { species, complexes, reactions } = network("2A + X -> 2X @ k\nX -> B @ 5\nk = 3\nfixed [A] = 2\nfixed [B] = 7");
    expect(species).toEqual(["X"]);
    expect(complexes.map((c) => c.text)).toEqual(["X", "2X", "0"]);
    expect(reactions[0].rate).toBe(3 * 2 ** 2);
    expect(reactions[0].coefficient).toEqual([
      [
        { kind: "parameter", symbol: "k", power: 1 },
        { kind: "fixed", symbol: "A", power: 2 },
      ],
    ]);
    // A fixed product does not change the rate.
    expect(reactions[1]).toMatchObject({ from: 0, to: 2, rate: 5 });
  });

  it("leaves out a step that changes only fixed species", () => {
    expect(network("A + X -> X @ 1\nX -> Y @ 1\nfixed [A] = 1").reactions).toHaveLength(1);
  });

  it("leaves out a direction whose coefficient is 0: literal, by parameter or by a fixed reactant at 0", () => {
    const literal = network("A -> B @ 0\nB -> C @ 1");
    expect(literal.complexes.map((c) => c.text)).toEqual(["B", "C"]);
    expect(literal.reactions.map(({ from, to }) => [from, to])).toEqual([[0, 1]]);
    expect(literal.species).toEqual(["A", "B", "C"]); // a species stays, constant
    const parameter = network("A <=> B @ k1, k2\nk1 = 0\nk2 = 1");
    expect(parameter.complexes.map((c) => c.text)).toEqual(["A", "B"]);
    expect(parameter.reactions.map(({ from, to, rate }) => ({ from, to, rate }))).toEqual([{ from: 1, to: 0, rate: 1 }]);
    const fixed = network("A + F -> B @ 2\nB -> A @ 1\nfixed [F] = 0");
    expect(fixed.reactions.map(({ from, to }) => [from, to])).toEqual([[0, 1]]);
    expect(fixed.complexes.map((c) => c.text)).toEqual(["B", "A"]);
    // a complex another reaction uses stays; a duplicate with a coefficient keeps the reaction
    expect(network("A -> B @ 0\nA -> C @ 1").complexes.map((c) => c.text)).toEqual(["A", "C"]);
    const merged = network("A -> B @ 0\nA -> B @ 3").reactions;
    expect(merged.map(({ rate, steps }) => ({ rate, steps }))).toEqual([{ rate: 3, steps: [1] }]);
  });

  it("keeps a step without a coefficient: missing is not 0", () => {
    expect(network("A -> B").reactions).toHaveLength(1);
  });

  it("keeps a custom law as the reaction's rate and names missing coefficients", () => {
    const { reactions } = network("S -> P @ { Vmax*S/(Km + S) }\nP -> Q\nlabelled: Q <=> R\nVmax = 1\nKm = 2");
    expect(reactions[0]).toMatchObject({ rate: null, law: "Vmax*S/(Km + S)", coefficient: null });
    expect(reactions[1].coefficient).toEqual([[{ kind: "missing", symbol: "k_line2", power: 1 }]]);
    expect(reactions[2].coefficient![0][0].symbol).toBe("kf_labelled");
    expect(reactions[3].coefficient![0][0].symbol).toBe("kb_labelled");
  });

  it("merges a custom law with a mass-action duplicate into one law", () => {
    const { reactions } = network("S -> P @ { V*S }\nS -> P @ 2\nV = 1");
    expect(reactions).toHaveLength(1);
    expect(reactions[0].law).toBe("(V*S) + (2*S)");
  });

  it("gives reaction vectors y' − y", () => {
    const net = network("X + Y -> 2Y @ 1");
    expect(reactionVector(net, net.reactions[0])).toEqual({ indices: [0, 1], values: [-1, 1] });
  });
});
