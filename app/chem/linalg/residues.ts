// Arithmetic modulo the one prime of the modular path: residues, inverses, and reading a residue
// back as a small fraction.

/** Below 2^26, so the product of two residues (< 2^52) is exact in a double. */
export const prime = 67_108_859;

/** Rational reconstruction recovers n/d with |n|, d up to √(p/2). */
const liftBound = Math.floor(Math.sqrt(prime / 2));

const inversePrime = 1 / prime;

/**
 * The residue in [0, p) of an integer whose magnitude stays below 2^53. The quotient is estimated
 * with a multiplication, off by at most one and corrected: several times faster than `%`, which
 * V8 computes by a floating-point remainder call, and this runs in every inner loop.
 */
export function residue(value: number): number {
  const reduced = value - Math.floor(value * inversePrime) * prime;
  return reduced < 0 ? reduced + prime : reduced >= prime ? reduced - prime : reduced;
}

export function modularInverse(value: number): number {
  let [r0, r1] = [prime, value];
  let [t0, t1] = [0, 1];
  while (r1 !== 0) {
    const q = Math.floor(r0 / r1);
    [r0, r1] = [r1, r0 - q * r1];
    [t0, t1] = [t1, t0 - q * t1];
  }
  return residue(t0);
}

/** n/d ≡ value (mod p) with |n|, d ≤ liftBound, by the half-extended Euclidean algorithm. */
export function reconstruct(value: number): { numerator: number; denominator: number } | null {
  let [r0, r1] = [prime, value];
  let [t0, t1] = [0, 1];
  while (r1 > liftBound) {
    const q = Math.floor(r0 / r1);
    [r0, r1] = [r1, r0 - q * r1];
    [t0, t1] = [t1, t0 - q * t1];
  }
  if (t1 === 0 || Math.abs(t1) > liftBound) return null;
  return t1 < 0 ? { numerator: -r1, denominator: -t1 } : { numerator: r1, denominator: t1 };
}
