import { describe, expect, it } from "vitest";
import { parseMechanism } from "./parse";
import { applyEdits, declaredValueEdits, valueText } from "./declared-values";

const source = `# A relay with an inline and a standalone coefficient.
bind: A + B <=> C @ k_on = 2.0, k_off = -1 # a sign is read, then reported
go: C -> D @ 2 * k_cat
k_cat = 0.5
[A]0 = 1.0
[B]0=3
`;

describe("declared values", () => {
  it("changes only the numbers, sign included, and keeps comments and layout", () => {
    const { edits, undeclared, previous } = declaredValueEdits(source, { k_on: 3.25, k_off: 0.125, k_cat: 1 / 3, "[A]0": 0.5, "[B]0": 2e-7 });
    expect(undeclared).toEqual([]);
    expect(previous).toEqual({ k_on: 2, k_off: -1, k_cat: 0.5, "[A]0": 1, "[B]0": 3 });
    const next = applyEdits(source, edits);
    expect(next).toBe(`# A relay with an inline and a standalone coefficient.
bind: A + B <=> C @ k_on = 3.25, k_off = 0.125 # a sign is read, then reported
go: C -> D @ 2 * k_cat
k_cat = 0.333333
[A]0 = 0.5
[B]0=2e-7
`);
    const { mechanism } = parseMechanism(next);
    expect(mechanism.parameters).toMatchObject({ k_on: 3.25, k_off: 0.125, k_cat: 0.333333 });
    expect(mechanism.initial).toMatchObject({ A: 0.5, B: 2e-7 });
  });

  it("adds a line for an initial value the text does not give, and names an undeclared parameter", () => {
    const { edits, undeclared } = declaredValueEdits(source, { "[C]0": 0.25, T: 300 });
    expect(undeclared).toEqual(["T"]);
    expect(applyEdits(source, edits).endsWith("[B]0=3\n[C]0 = 0.25\n")).toBe(true);
  });

  it("never takes a number inside an expression for a declared value", () => {
    const { undeclared } = declaredValueEdits("go: C -> D @ k * 2\n", { k: 1 });
    expect(undeclared).toEqual(["k"]);
  });

  it("writes six significant digits in the grammar's syntax", () => {
    expect(valueText(1234567)).toBe("1234570");
    expect(valueText(1e21)).toBe("1e+21");
    expect(valueText(0.000123456789)).toBe("0.000123457");
  });
});
