// Numbers as a chemist reads them: positional between 10^-3 and 10^5, a × 10^n outside it, so that
// 12000000000000 and 0.0000012 never have to be counted digit by digit. One rule for the typeset
// equations, the LaTeX export, chart ticks and tooltips.

/** value = mantissa × 10^exponent; exponent null means the mantissa is the whole number. */
export interface ReadableNumber {
  mantissa: string;
  exponent: number | null;
}

const positional = { from: 1e-3, below: 1e5 };

/**
 * `digits` significant digits (trailing zeros dropped), or every digit the number has when
 * omitted. An exact integer below 10^5 is written whole: 12000 says more than 1.2 × 10^4.
 */
export function readableNumber(value: number, digits?: number): ReadableNumber {
  if (!Number.isFinite(value) || value === 0) return { mantissa: String(value), exponent: null };
  const magnitude = Math.abs(value);
  if (magnitude < positional.from || magnitude >= positional.below) return scientific(value, digits);
  if (Number.isInteger(value) || digits === undefined) return { mantissa: String(value), exponent: null };
  // Never round away digits before the decimal point: 1234.56 keeps four.
  const integerDigits = Math.max(0, Math.floor(Math.log10(magnitude)) + 1);
  return { mantissa: String(Number(value.toPrecision(Math.max(digits, integerDigits)))), exponent: null };
}

function scientific(value: number, digits?: number): ReadableNumber {
  if (value === 0) return { mantissa: "0", exponent: null };
  const [mantissa, exponent] = (digits === undefined ? value.toExponential() : value.toExponential(digits - 1)).split("e");
  return { mantissa: mantissa.includes(".") ? mantissa.replace(/\.?0+$/, "") : mantissa, exponent: Number(exponent) };
}

/** "3 \times 10^{9}", "10^{-7}", "0.012". */
export function readableNumberLatex(value: number, digits?: number): string {
  const { mantissa, exponent } = readableNumber(value, digits);
  if (exponent === null) return mantissa;
  const power = `10^{${exponent}}`;
  if (mantissa === "1") return power;
  if (mantissa === "-1") return `-${power}`;
  return `${mantissa} \\times ${power}`;
}

const superscriptDigits = "⁰¹²³⁴⁵⁶⁷⁸⁹";

/** "3×10⁹", "−2.5×10⁻⁷", "0.012": for canvas labels, tooltips and plain text beside a chart. */
export function readableNumberText(value: number, digits?: number): string {
  return numberText(readableNumber(value, digits));
}

function numberText({ mantissa, exponent }: ReadableNumber): string {
  const sign = (text: string) => text.replace(/^-/, "−");
  if (exponent === null) return sign(mantissa);
  const power = `10${String(exponent).replace("-", "⁻").replace(/\d/g, (d) => superscriptDigits[Number(d)])}`;
  if (mantissa === "1") return power;
  if (mantissa === "-1") return `−${power}`;
  return `${sign(mantissa)}×${power}`;
}

/**
 * Labels for axis ticks, in one notation for the whole axis (a × 10^n when the largest tick is
 * beyond 10^5 or below 10^-3): the fewest digits that tell every tick apart and put each label
 * within a thousandth of a tick spacing of its value (never "0, 0, 0.001").
 */
export function tickLabels(ticks: number[]): string[] {
  const finite = [...new Set(ticks.filter(Number.isFinite))].sort((a, b) => a - b);
  if (finite.length === 0) return ticks.map(String);
  const largest = Math.max(...finite.map(Math.abs));
  const spacing = finite.slice(1).reduce((least, value, index) => Math.min(least, value - finite[index]), Infinity);
  const tolerance = Number.isFinite(spacing) ? spacing * 1e-3 : largest * 1e-3;
  const inScientific = largest >= positional.below || (largest > 0 && largest < positional.from);
  const write = (tick: number, precision: number) =>
    inScientific ? numberText(scientific(tick, precision)) : String(Number(tick.toFixed(precision - 1)));
  for (let precision = 1; precision <= 16; precision++) {
    const labels = ticks.map((tick) => (Number.isFinite(tick) ? write(tick, precision) : ""));
    const faithful = ticks.every((tick, index) => !Number.isFinite(tick) || Math.abs(readNumberText(labels[index]) - tick) <= tolerance);
    if (faithful && new Set(labels).size === new Set(ticks).size) return labels.map((label) => label.replace(/^-/, "−"));
  }
  return ticks.map((tick) => readableNumberText(tick));
}

/** The value a readableNumberText or tick label stands for. */
export function readNumberText(label: string): number {
  const plain = label
    .replace(/−/g, "-")
    .replace(/×10/, "e")
    .replace(/^(-?)10(?=[⁻⁰¹²³⁴⁵⁶⁷⁸⁹])/, "$11e")
    .replace(/⁻/g, "-")
    .replace(/[⁰¹²³⁴⁵⁶⁷⁸⁹]/g, (d) => String(superscriptDigits.indexOf(d)));
  return Number(plain);
}
