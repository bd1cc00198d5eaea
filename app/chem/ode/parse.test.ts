import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { readFileSync } from "node:fs";
import { parseOde } from "./parse";
import { toText } from "../linalg/rational";

const fixture = (name: string) => readFileSync(`tests/fixtures/ode/${name}`, "utf8");

describe("parseOde", () => {
  it("reads the Lorenz system with exact coefficients (beta = 8/3 stays 8/3)", () => {
    const { ode, exact, diagnostics } = parseOde(fixture("lorenz.ode"));
    expect(diagnostics).toEqual([]);
    expect(ode!.variables).toEqual(["x", "y", "z"]);
    expect(ode!.initial).toEqual([1, 1, 1]);
    const z = exact!.rhs[2];
    expect(toText(z.get("0,0,1")!.coefficient)).toBe("-8/3");
    expect(toText(z.get("1,1,0")!.coefficient)).toBe("1");
    expect(ode!.rhs[1]).toEqual(
      expect.arrayContaining([
        { coefficient: -1, exponents: [1, 0, 1] },
        { coefficient: 28, exponents: [1, 0, 0] },
        { coefficient: -1, exponents: [0, 1, 0] },
      ]),
    );
  });

  it("evaluates functions of numbers", () => {
    expect(parseOde("x' = sqrt(4)*x + exp(0)\n").ode!.rhs[0]).toEqual([
      { coefficient: 2, exponents: [1] },
      { coefficient: 1, exponents: [0] },
    ]);
  });

  it("knows pi and e unless they are taken, and accepts a typographic prime", () => {
    expect(parseOde("x′ = pi*x\n").ode!.rhs[0][0].coefficient).toBe(Math.PI);
    expect(parseOde("e' = -e\n").ode!.rhs[0]).toEqual([{ coefficient: -1, exponents: [1] }]);
  });

  it("reads decimals exactly and accepts dx/dt", () => {
    const { exact } = parseOde("dx/dt = 2.667*x - 1e-3\n");
    expect(toText(exact!.rhs[0].get("1")!.coefficient)).toBe("2667/1000");
    expect(toText(exact!.rhs[0].get("0")!.coefficient)).toBe("-1/1000");
  });

  it("traces each expanded term to the summand it was written in", () => {
    const text = "x' = y\ny' = x*(28 - z) - y\nz' = x\n";
    const { sources } = parseOde(text);
    const [span] = sources[1].terms.get("1,0,1")!;
    expect(text.slice(span.from, span.to)).toBe("x*(28 - z)");
    expect(text.slice(...(({ from, to }) => [from, to])(sources[1].terms.get("0,1,0")![0]))).toBe("- y");
  });

  it.each([
    ["x' = x/y\ny' = 1", 1, 6, "division"],
    ["x' = x^0.5", 1, 6, "non-negative integer power"],
    ["x' = sin(x)", 1, 6, "sin"],
    ["x' = 2*w", 1, 8, "unknown name w"],
    ["x' = 1\nx' = 2", 2, 1, "second equation for x"],
    ["x' = 1\ny(0) = 2", 2, 1, "no equation"],
    ["x' = 2*y\ny(0) = 2", 1, 8, "initial value but no equation"],
    ["x' = (1 +", 1, 10, "cannot read the expression"],
    ["x' = x*t", 1, 8, "autonomous"],
    ["x' = toString*x", 1, 6, "unknown name toString"],
    ["x' = import(1)*x", 1, 6, "unknown function import"],
    ["x' = sqrt(1, 2)*x", 1, 6, "sqrt(1, 2)"],
    ["x' = sqrt(-1)*x", 1, 6, "not a finite number"],
    ["x' = 1\nx(0) = 2*x", 2, 10, "x is a variable"],
    ["k = 1\nk = 2\nx' = k", 2, 1, "second value of k"],
    ["x' = 1\nx = 3", 2, 1, "cannot also be a parameter"],
    ["x' = 1\nthis is not it", 2, 1, "expected x' ="],
    ["x' = (x + y + z)^150\ny' = 1\nz' = 1", 1, 6, "more than 10,000 terms"],
    ["x' = x^5000", 1, 6, "beyond the limit"],
    ["x' = 1e400*x", 1, 6, "not a finite number"],
    ["x' = (-2)^0.5", 1, 6, "not a finite real number"],
  ])("reports %j at line %i column %i", (text, line, column, message) => {
    const { ode, diagnostics } = parseOde(text);
    expect(ode).toBeNull();
    expect(diagnostics[0]).toMatchObject({ severity: "error", line, column, message: expect.stringContaining(message) });
  });

  it("never throws, whatever the text: every problem is a diagnostic (fast-check)", () => {
    const token = fc.constantFrom("x", "y", "k", "'", "d", "/dt", "=", "(0)", "+", "-", "*", "/", "^", "(", ")", "2", "0.5", "1e400", "#", "\n", " ", "sin", "t", ",", "[", "!");
    fc.assert(
      fc.property(fc.oneof(fc.string(), fc.array(token, { maxLength: 40 }).map((t) => t.join(""))), (text) => {
        const { ode, diagnostics } = parseOde(text);
        expect(ode === null).toBe(diagnostics.some((d) => d.severity === "error"));
        for (const d of diagnostics) expect(d.from).toBeLessThanOrEqual(d.to);
      }),
      { numRuns: 500 },
    );
  });
});
