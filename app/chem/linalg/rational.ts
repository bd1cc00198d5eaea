// Exact rational numbers on bigints. The realization algebra compares polynomials term by term, so
// coefficients such as 8/3 or 2.667 must not pass through floating point.

import { gcd } from "./integers";

export interface Rational {
  /** Numerator and denominator in lowest terms; the denominator is always positive. */
  readonly num: bigint;
  readonly den: bigint;
}

export function rational(num: bigint | number, den: bigint | number = 1n): Rational {
  let n = BigInt(num);
  let d = BigInt(den);
  if (d === 0n) throw new RangeError("rational with zero denominator");
  if (d < 0n) [n, d] = [-n, -d];
  const g = gcd(n, d) || 1n;
  return { num: n / g, den: d / g };
}

export const ZERO = rational(0n);
export const ONE = rational(1n);

export const add = (a: Rational, b: Rational) => rational(a.num * b.den + b.num * a.den, a.den * b.den);
export const sub = (a: Rational, b: Rational) => rational(a.num * b.den - b.num * a.den, a.den * b.den);
export const mul = (a: Rational, b: Rational) => rational(a.num * b.num, a.den * b.den);
export const neg = (a: Rational): Rational => ({ num: -a.num, den: a.den });
export const abs = (a: Rational): Rational => (a.num < 0n ? neg(a) : a);
export const isZero = (a: Rational) => a.num === 0n;
export const sign = (a: Rational) => (a.num > 0n ? 1 : a.num < 0n ? -1 : 0);
export const equals = (a: Rational, b: Rational) => a.num === b.num && a.den === b.den;

export function div(a: Rational, b: Rational): Rational {
  if (b.num === 0n) throw new RangeError("division by zero");
  return rational(a.num * b.den, a.den * b.num);
}

export function pow(a: Rational, exponent: number): Rational {
  return exponent >= 0
    ? rational(a.num ** BigInt(exponent), a.den ** BigInt(exponent))
    : div(ONE, pow(a, -exponent));
}

/** Parses a decimal literal (`-2.667`, `1.5e-3`) exactly; null if it is not one. */
export function parseDecimal(text: string): Rational | null {
  const match = /^([+-]?)(\d*)(?:\.(\d*))?(?:[eE]([+-]?\d+))?$/.exec(text.trim());
  if (!match || (match[2] === "" && !match[3])) return null;
  const [, signText, whole, fraction = "", exponentText = "0"] = match;
  const digits = BigInt((whole || "0") + fraction) * (signText === "-" ? -1n : 1n);
  const exponent = Number(exponentText) - fraction.length;
  return exponent >= 0 ? rational(digits * 10n ** BigInt(exponent)) : rational(digits, 10n ** BigInt(-exponent));
}

/**
 * The rational a finite double stands for as written: its shortest round-trip decimal, so the
 * literal 2.667 becomes 2667/1000 rather than the binary fraction nearest to it.
 */
export function fromNumber(value: number): Rational {
  if (!Number.isFinite(value)) throw new RangeError(`not a finite number: ${value}`);
  return parseDecimal(String(value)) as Rational;
}

/**
 * The simplest fraction that reads back as this double: the first continued-fraction convergent of
 * its decimal that does. 0.3333333333333333 is 1/3 and 0.1 is 1/10, so numbers that came from
 * small fractions (an ODE's 8/3, an integer stoichiometry) become those fractions again.
 */
export function simplestRational(value: number): Rational {
  if (Number.isSafeInteger(value)) return rational(value);
  const exact = fromNumber(value);
  if (exact.den === 1n) return exact;
  let [numerator, denominator] = [exact.num, exact.den];
  let [h0, h1, k0, k1] = [0n, 1n, 1n, 0n];
  while (denominator !== 0n) {
    // Floor division, so negative values expand correctly too.
    let quotient = numerator / denominator;
    if (numerator % denominator !== 0n && numerator < 0n) quotient -= 1n;
    [numerator, denominator] = [denominator, numerator - quotient * denominator];
    [h0, h1] = [h1, quotient * h1 + h0];
    [k0, k1] = [k1, quotient * k1 + k0];
    const convergent = rational(h1, k1);
    if (toNumber(convergent) === value) return convergent;
  }
  return exact;
}

export function toNumber(a: Rational): number {
  // Scale huge operands down first so Number() does not overflow to Infinity/Infinity.
  const shift = BigInt(Math.max(0, Math.max(a.num.toString(2).length, a.den.toString(2).length) - 1000));
  return Number(a.num >> shift) / Number(a.den >> shift);
}

/** `3`, `-8/3`: the form the `.ode` language reads back exactly. */
export function toText(a: Rational): string {
  return a.den === 1n ? a.num.toString() : `${a.num}/${a.den}`;
}
