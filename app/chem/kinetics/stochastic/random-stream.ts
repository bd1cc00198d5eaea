// One random stream per run, derived from the ensemble's seed and the run's index alone, so a run
// draws the same numbers whichever worker runs it and whatever other runs share that worker.
// xoroshiro128+ (pure-rand) has a period of 2^128 − 1; its 128-bit state is filled from (seed,
// index) by a 32-bit finaliser, as its authors advise seeding from a different generator rather
// than from nearby integers. Streams of different runs start at unrelated points of the period.

import { xoroshiro128plusFromState } from "pure-rand/generator/xoroshiro128plus";
import { uniformFloat64 } from "pure-rand/distribution/uniformFloat64";

/** The finaliser of MurmurHash3 (public domain): every input bit reaches every output bit. */
function mix32(value: number): number {
  let h = value >>> 0;
  h = Math.imul(h ^ (h >>> 16), 0x85ebca6b);
  h = Math.imul(h ^ (h >>> 13), 0xc2b2ae35);
  return (h ^ (h >>> 16)) | 0;
}

/** Uniform numbers in (0, 1] for run `index` of the ensemble seeded with `seed` (never 0: they go into a logarithm). */
export function runStream(seed: number, index: number): () => number {
  const words = [0, 1, 2, 3].map((word) => mix32(mix32(mix32(seed) ^ Math.imul(index + 1, 0x9e3779b9)) + word * 0x6a09e667));
  // An all-zero state would be a fixed point; the chance is 2^-128, but say so.
  if (!words.some((w) => w !== 0)) words[0] = 1;
  const generator = xoroshiro128plusFromState(words);
  return () => 1 - uniformFloat64(generator);
}
