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
    expect(latex.X).toBe("\\frac{dX}{dt} = k_{1}\\, X - k_{2}\\, X Y");
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
    expect(latex.ATP).toBe("\\frac{d\\mathrm{ATP}}{dt} = -\\alpha\\, \\mathrm{ATP} k_{f}");
    expect(latex["Fe3+"]).toBe("\\frac{d\\mathrm{Fe3+}}{dt} = \\alpha\\, \\mathrm{ATP} k_{f}");
  });
});
