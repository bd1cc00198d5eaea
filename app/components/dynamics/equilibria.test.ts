import { createElement } from "react";
import { renderToString } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { parseForAnalysis } from "~/chem/analysis";
import { networkEquilibrium } from "~/chem/kinetics/equilibrium";
import { buildNetwork } from "~/chem/network";
import { EquilibriumList } from "./equilibria";

describe("EquilibriumList", () => {
  it("lists each equilibrium of a bistable network with its stability", () => {
    // −(x − 1)(x − 2)(x − 3) as mass action: 2X → 3X, 3X → 2X, 0 → X, X → 0 (worked by hand).
    const source = "2X -> 3X @ 6\n3X -> 2X @ 1\n0 -> X @ 6\nX -> 0 @ 11\n[X]0 = 0.5";
    const { mechanism } = parseForAnalysis(source);
    const html = renderToString(createElement(EquilibriumList, { result: networkEquilibrium(mechanism, buildNetwork(mechanism)) }));
    expect(html).toContain("3 distinct equilibria");
    expect(html.match(/data-testid="equilibrium-entry"/g)).toHaveLength(3);
    expect(html).toMatch(/Equilibrium 1: <!-- -->stable/);
    expect(html).toContain("unstable");
  });
});
