import { describe, expect, it } from "vitest";
import { readNumberText, readableNumber, readableNumberLatex, readableNumberText, tickLabels } from "./numbers";

describe("readableNumber", () => {
  it("writes numbers between 10^-3 and 10^5 positionally, exact short integers whole", () => {
    expect(readableNumberText(12000, 3)).toBe("12000");
    expect(readableNumberText(0.012, 3)).toBe("0.012");
    expect(readableNumberText(0.0123456, 3)).toBe("0.0123");
    expect(readableNumberText(1234.56, 3)).toBe("1235");
    expect(readableNumberText(0.001, 3)).toBe("0.001");
  });

  it("writes larger and smaller numbers as a × 10^n with three significant digits", () => {
    expect(readableNumberLatex(12000000000000, 3)).toBe("1.2 \\times 10^{13}");
    expect(readableNumberLatex(3e9, 3)).toBe("3 \\times 10^{9}");
    expect(readableNumberLatex(1e17, 3)).toBe("10^{17}");
    expect(readableNumberLatex(-1e5, 3)).toBe("-10^{5}");
    expect(readableNumberLatex(2.34567e-7, 3)).toBe("2.35 \\times 10^{-7}");
    expect(readableNumberText(-2.5e-7, 3)).toBe("−2.5×10⁻⁷");
    expect(readableNumberText(6.02214076e23, 3)).toBe("6.02×10²³");
  });

  it("keeps every digit when no precision is asked for", () => {
    expect(readableNumber(1.23456789e10)).toEqual({ mantissa: "1.23456789", exponent: 10 });
    expect(readableNumber(0.0123456)).toEqual({ mantissa: "0.0123456", exponent: null });
    expect(readableNumberLatex(0)).toBe("0");
  });

  it("reads its own labels back", () => {
    for (const value of [3e9, -2.5e-7, 1e17, -1e-9, 0.012, 12000, 4.5e-4]) {
      expect(readNumberText(readableNumberText(value))).toBeCloseTo(value, 20);
      expect(readNumberText(readableNumberText(value)) / value).toBeCloseTo(1, 12);
    }
  });
});

describe("tickLabels", () => {
  it("tells close time ticks apart instead of rounding them to 0, 0, 0.001", () => {
    expect(tickLabels([0, 0.0002, 0.0004, 0.0006, 0.0008, 0.001])).toEqual(["0", "0.0002", "0.0004", "0.0006", "0.0008", "0.001"]);
    expect(tickLabels([0, 0.25, 0.5, 0.75, 1])).toEqual(["0", "0.25", "0.5", "0.75", "1"]);
  });

  it("writes micromolar and huge axes as a × 10^n", () => {
    expect(tickLabels([0, 2e-7, 4e-7, 6e-7])).toEqual(["0", "2×10⁻⁷", "4×10⁻⁷", "6×10⁻⁷"]);
    expect(tickLabels([0, 5e10, 1e11, 1.5e11])).toEqual(["0", "5×10¹⁰", "10¹¹", "1.5×10¹¹"]);
    expect(tickLabels([1e-9, 1e-8, 1e-7])).toEqual(["10⁻⁹", "10⁻⁸", "10⁻⁷"]);
  });

  it("adds digits until neighbouring ticks differ", () => {
    const labels = tickLabels([1.0001e-6, 1.0002e-6, 1.0003e-6]);
    expect(labels).toEqual(["1.0001×10⁻⁶", "1.0002×10⁻⁶", "1.0003×10⁻⁶"]);
    expect(tickLabels([-1, -0.5, 0, 0.5, 1])).toEqual(["−1", "−0.5", "0", "0.5", "1"]);
  });
});
