import { describe, expect, it } from "vitest";
import { buildNetwork } from "./network";
import { inducedOdes } from "./odes";
import { parseMechanism } from "./parse";

const odes = (source: string) => inducedOdes(buildNetwork(parseMechanism(source).mechanism));

describe("inducedOdes", () => {
  it("writes mass-action terms with the author's rate names", () => {
    expect(odes("X + Y -> X @ k1\n2Y -> 4Y @ k2\nk1 = 1\nk2 = 1").text).toEqual({ X: "0", Y: "-k1*X*Y + 2*k2*Y^2" });
  });

  it("gives the Lotka–Volterra equations x' = k1 x − k2 x y, y' = k2 x y − k3 y (Lotka 1920)", () => {
    const { text, latex } = odes("X -> 2X @ k1\nX + Y -> 2Y @ k2\nY -> 0 @ k3\nk1 = 1\nk2 = 1\nk3 = 1");
    expect(text).toEqual({ X: "k1*X - k2*X*Y", Y: "k2*X*Y - k3*Y" });
    expect(latex.X).toBe("\\frac{d[\\mathrm{X}]}{dt} = k_{1}\\, [\\mathrm{X}] \\allowbreak - k_{2}\\, [\\mathrm{X}][\\mathrm{Y}]");
  });

  it("keeps literal coefficients, sums merged duplicates and names fixed species", () => {
    const { text } = odes("A + X -> 2X @ 0.5\nX -> Y @ k\nX -> Y @ 2\nk = 1\nfixed [A] = 3");
    expect(text).toEqual({ X: "0.5*A*X - (k + 2)*X", Y: "(k + 2)*X" });
  });

  it("parenthesises a custom law only where its sign or a multiplier needs it", () => {
    const { text, latex } = odes("S -> 2P @ { a*S + b }\na = 1\nb = 2");
    expect(text).toEqual({ S: "-(a*S + b)", P: "2*(a*S + b)" });
    expect(latex.P).toContain("\\left(");
  });

  it("typesets names: subscripts, multi-letter names upright, quoted names escaped", () => {
    const { latex } = odes('ATP + k_f -> "Fe3+" @ alpha\nalpha = 1');
    expect(latex.ATP).toBe("\\frac{d[\\mathrm{ATP}]}{dt} = -\\alpha\\, [\\mathrm{ATP}][\\mathrm{k}_{f}]");
    expect(latex["Fe3+"]).toBe("\\frac{d[\\mathrm{Fe3+}]}{dt} = \\alpha\\, [\\mathrm{ATP}][\\mathrm{k}_{f}]");
  });

  // Hand-worked: each term is (net change) × (literal factors) × named factors × concentrations.
  describe("typeset for reading", () => {
    const right = (latex: string) => latex.slice(latex.indexOf(" = ") + 3);

    it("multiplies the stoichiometric factor into the coefficient: 2 × 1.5e9 = 3 × 10^9", () => {
      const { latex, text } = odes("2A -> B @ 1.5e9");
      expect(right(latex.A)).toBe("-{3 \\times 10^{9}}\\, [\\mathrm{A}]^{2}");
      expect(right(latex.B)).toBe("{1.5 \\times 10^{9}}\\, [\\mathrm{A}]^{2}");
      expect(text.A).toBe("-2*1500000000*A^2");
    });

    it("keeps a product of two species apart from a two-letter species", () => {
      const { latex } = odes("M + H -> 2 MH @ 0.012\nMH -> M + H @ 12000000000000");
      expect(right(latex.MH)).toBe("0.024\\, [\\mathrm{M}][\\mathrm{H}] \\allowbreak - {1.2 \\times 10^{13}}\\, [\\mathrm{MH}]");
    });

    it("combines like terms: literal coefficients add, equal names count", () => {
      expect(right(odes("X -> Y @ 0.5\nX -> Z @ 0.25").latex.X)).toBe("-0.75\\, [\\mathrm{X}]");
      expect(right(odes("A -> B @ k\nA -> C @ k\nk = 1").latex.A)).toBe("-2\\, k\\, [\\mathrm{A}]");
      // 2 k [X] gained by the first step, k [X] lost by the second: k [X] in all.
      expect(right(odes("X -> 3X @ k\nX -> 0 @ k\nX + Y -> Y @ k\nk = 1").latex.X)).toBe("k\\, [\\mathrm{X}] \\allowbreak - k\\, [\\mathrm{X}][\\mathrm{Y}]");
    });

    it("drops terms that cancel and writes 0 when none is left", () => {
      expect(right(odes("X -> 2X @ 2\nX -> 0 @ 2").latex.X)).toBe("0");
      expect(right(odes("X -> 2X @ 0.1\nX -> 2X @ 0.2\nX -> 0 @ 0.3\nX -> Y @ 1").latex.X)).toBe("-[\\mathrm{X}]");
    });

    it("writes a merged sum term by term and a held species in brackets", () => {
      expect(right(odes("A + X -> 2X @ 0.5\nX -> Y @ k\nX -> Y @ 2\nk = 1\nfixed [A] = 3").latex.X)).toBe(
        "0.5\\, [\\mathrm{A}][\\mathrm{X}] \\allowbreak - k\\, [\\mathrm{X}] \\allowbreak - 2\\, [\\mathrm{X}]",
      );
    });
  });
});
