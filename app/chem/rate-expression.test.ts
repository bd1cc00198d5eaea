import fc from "fast-check";
import { evaluate } from "mathjs";
import { describe, expect, it } from "vitest";
import { rateExpressionLatex } from "./expression";
import type { RateExpression } from "./model";
import { buildNetwork } from "./network";
import { inducedOdes } from "./odes";
import { parseMechanism, parseMechanismWithSettings, printMechanism } from "./parse";
import { evaluateRateExpression, rateExpressionParameters, rateExpressionText } from "./rate-expression";

const arrhenius = "r1: A + B -> C @ 2.0e6 * T^0.5 * exp(-6000 / T)\nT = 1000\n";

function forward(source: string): RateExpression {
  const rate = parseMechanism(source).mechanism.steps[0].forward;
  if (rate?.kind !== "expression") throw new Error(`expected an expression, got ${JSON.stringify(rate)}`);
  return rate.expression;
}

function errors(source: string): string[] {
  return parseMechanism(source)
    .diagnostics.filter((d) => d.severity === "error")
    .map((d) => `${d.line}:${d.column} ${d.message}`);
}

describe("rate coefficients as expressions", () => {
  it("reads the Arrhenius form with T as a parameter and folds its value into the network", () => {
    const { mechanism, diagnostics } = parseMechanism(arrhenius);
    expect(diagnostics).toEqual([]);
    const tree = forward(arrhenius);
    expect(rateExpressionText(tree)).toBe("2000000*T^0.5*exp(-6000/T)");
    expect(rateExpressionParameters(tree)).toEqual(["T"]);
    // 2e6·√1000·e^−6, computed by hand: 2e6 × 31.6227766 × 0.002478752 = 156 771.5…
    const [reaction] = buildNetwork(mechanism).reactions;
    expect(reaction.rate).toBeCloseTo(2e6 * Math.sqrt(1000) * Math.exp(-6), 6);
    expect(reaction.coefficient![0][0]).toMatchObject({ kind: "expression", expression: { value: reaction.rate } });
  });

  it("keeps simple rates as values and parameters, and an inline declaration as before", () => {
    const { mechanism } = parseMechanism("X <=> Y @ k1 = 0.1, 2*k1\nY -> Z @ 3\nZ -> X @ k1");
    expect(mechanism.steps.map((step) => [step.forward?.kind, step.backward?.kind])).toEqual([
      ["parameter", "expression"],
      ["value", undefined],
      ["parameter", undefined],
    ]);
    expect(buildNetwork(mechanism).reactions.map((reaction) => reaction.rate)).toEqual([0.1, 0.2, 3, 0.1]);
  });

  it("prints a text that reads back into the same coefficients", () => {
    const source = "X -> Y @ (k1 - 5)*2^-(1/2)\nY -> X @ -(a + b)*-1 / (c*d)\nk1 = 7\na = 1\nb = 2\nc = 3\nd = 4\n";
    const first = parseMechanism(source);
    expect(first.diagnostics).toEqual([]);
    const again = parseMechanism(printMechanism(first.mechanism));
    expect(again.diagnostics).toEqual([]);
    expect(buildNetwork(again.mechanism).reactions.map((r) => r.rate)).toEqual(buildNetwork(first.mechanism).reactions.map((r) => r.rate));
    expect(buildNetwork(first.mechanism).reactions[0].rate).toBeCloseTo(2 / Math.SQRT2, 12);
  });

  it("agrees with mathjs on random expressions (an independent evaluator)", () => {
    const leaf = fc.oneof(
      fc.constantFrom("a", "b", "T"),
      fc.double({ min: 0.1, max: 50, noNaN: true }).map((x) => String(Number(x.toPrecision(4)))),
    );
    const tree = fc.letrec<{ text: string }>((tie) => ({
      text: fc.oneof(
        { depthSize: "small", withCrossShrink: true },
        leaf,
        fc.tuple(tie("text"), fc.constantFrom("+", "-", "*", "/"), tie("text")).map(([l, op, r]) => `(${l}) ${op} (${r})`),
        tie("text").map((x) => `-(${x})`),
        tie("text").map((x) => `exp((${x}) / 100)`),
        tie("text").map((x) => `sqrt(abs_(${x}))`),
      ),
    })).text.map((text) => text.replaceAll("abs_", ""));
    fc.assert(
      fc.property(tree, (text) => {
        // sqrt of a negative has no real value: both sides must then refuse it.
        const source = `X -> Y @ 1*(${text})\na = 1.5\nb = 0.25\nT = 300\n`;
        const scope = { a: 1.5, b: 0.25, T: 300 };
        const expected = evaluate(text, scope) as number | { re: number; im: number };
        const ours = evaluateRateExpression(forward(source), scope);
        if (typeof expected !== "number" || !Number.isFinite(expected)) return !ours.ok;
        if (!ours.ok) return false;
        return Math.abs(ours.value - expected) <= 1e-12 * Math.max(1, Math.abs(expected));
      }),
      { numRuns: 300 },
    );
  });

  it("reports division by zero, log of a non-positive number and a negative result on the line", () => {
    expect(errors("X -> Y @ 1/(T - 300)\nT = 300")).toEqual(["1:10 This rate coefficient has no value: Division by zero in 1/(T - 300)."]);
    expect(errors("X -> Y @ k\nY -> X @ log(T - 400)\nT = 300\nk = 1")[0]).toMatch(/^2:10 .*log of -100 is not defined/);
    expect(errors("X -> Y @ sqrt(0 - T)\nT = 4")[0]).toMatch(/sqrt of -4 is not defined/);
    expect(errors("X -> Y @ a - b\na = 1\nb = 2")).toEqual(["1:10 A rate coefficient cannot be negative; a - b is -1."]);
    expect(errors("X -> Y @ (-2)^0.5")[0]).toMatch(/is not a real number/);
    expect(errors("X -> Y @ exp(1000)")[0]).toMatch(/too large/);
  });

  it("says which parameter is missing once, and refuses unknown functions", () => {
    expect(errors("X -> Y @ 2 * exp(-E / T)\nE = 6000")).toEqual(["1:23 T is used but never given a value: add a line T = …"]);
    expect(errors("X -> Y @ 2 * sin(T)\nT = 1")[0]).toMatch(/^1:14 sin\(\) is not a function a rate coefficient may use; use exp, log, sqrt/);
    expect(errors("X -> Y @ 2 * X\n")).toEqual(["1:14 X is a species (line 1), so it cannot also be a parameter; rename one of them."]);
  });

  it("a syntax error stays on its line, with a hint after an operator", () => {
    const { mechanism, diagnostics } = parseMechanism("X -> Y @ 2 *\nY -> Z @ 1");
    expect(diagnostics.map((d) => [d.line, d.message])).toEqual([[1, "Expected a number, a parameter or a parenthesised expression here."]]);
    expect(mechanism.steps).toHaveLength(1);
  });

  it("sees values given from outside (--set) in the coefficient and its diagnostics", () => {
    const hot = parseMechanismWithSettings(arrhenius, { parameters: { T: 1100 }, initial: {} });
    expect(hot.unknown).toEqual([]);
    expect(buildNetwork(hot.mechanism).reactions[0].rate).toBeCloseTo(2e6 * Math.sqrt(1100) * Math.exp(-6000 / 1100), 6);
    expect(parseMechanismWithSettings("X -> Y @ 1/T\nT = 1", { parameters: { T: 0 }, initial: {} }).diagnostics[0].message).toMatch(/Division by zero/);
  });

  it("leaves a direction whose expression is 0 out of the network", () => {
    const { mechanism, diagnostics } = parseMechanism("X <=> Y @ 1, k*0\nk = 2");
    expect(diagnostics.map((d) => d.message)).toEqual(["rate coefficient 0: backward direction left out of the network"]);
    expect(buildNetwork(mechanism).reactions).toHaveLength(1);
  });

  it("writes the coefficient grouped in the ODE text (read back by mathjs) and typeset in LaTeX", () => {
    const { mechanism } = parseMechanism(arrhenius);
    const odes = inducedOdes(buildNetwork(mechanism));
    expect(odes.text.C).toBe("(2000000*T^0.5*exp(-6000/T))*A*B");
    expect(evaluate(odes.text.C, { T: 1000, A: 2, B: 3 })).toBeCloseTo(6 * 2e6 * Math.sqrt(1000) * Math.exp(-6), 3);
    expect(rateExpressionLatex(forward(arrhenius))).toBe(String.raw`2 \times 10^{6}\, T^{0.5}\, e^{-6000/T}`);
    // In the equations the expression's number joins the stoichiometric factor: 2 × 2e6 = 4 × 10^6.
    const doubled = inducedOdes(buildNetwork(parseMechanism("2 A -> B @ 2.0e6 * T^0.5 * exp(-6000 / T)\nT = 1000").mechanism));
    expect(doubled.latex.A).toBe(String.raw`\frac{d[\mathrm{A}]}{dt} = -{4 \times 10^{6}}\, T^{0.5}\, e^{-6000/T}\, [\mathrm{A}]^{2}`);
    expect(doubled.text.A).toBe("-2*(2000000*T^0.5*exp(-6000/T))*A^2");
  });

  it("typesets fractions stacked on the line and with a slash in an exponent", () => {
    const latex = (coefficient: string) => rateExpressionLatex(forward(`X -> Y @ ${coefficient}\nT = 300\nk = 2`));
    expect(latex("k / T")).toBe(String.raw`\frac{k}{T}`);
    expect(latex("exp(-k / (2 * T))")).toBe(String.raw`e^{-k/\left(2\, T\right)}`);
    expect(latex("(k / T)^2")).toBe(String.raw`\left(\frac{k}{T}\right)^{2}`);
    expect(latex("1.5e-7 * sqrt(T) + log(k)")).toBe(String.raw`1.5 \times 10^{-7}\, \sqrt{T} + \ln\left(k\right)`);
  });
});
