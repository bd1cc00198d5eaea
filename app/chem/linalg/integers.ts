// Integer arithmetic shared by the exact linear algebra and the rationals: the one gcd.

export function abs(value: bigint): bigint {
  return value < 0n ? -value : value;
}

/** The non-negative greatest common divisor; gcd(0, 0) = 0. */
export function gcd(a: bigint, b: bigint): bigint {
  let x = abs(a);
  let y = abs(b);
  while (y !== 0n) [x, y] = [y, x % y];
  return x;
}

export function lcm(a: bigint, b: bigint): bigint {
  return a === 0n || b === 0n ? 0n : abs((a / gcd(a, b)) * b);
}

/**
 * The same gcd on safe integers (|n| < 2^53): the modular fast path lifts thousands of small
 * entries, where bigint arithmetic would cost more than the elimination itself.
 */
export function smallGcd(a: number, b: number): number {
  let x = Math.abs(a);
  let y = Math.abs(b);
  while (y !== 0) [x, y] = [y, x % y];
  return x;
}
