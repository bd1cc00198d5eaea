// The one kernel of every tableau-driven stage loop: a weighted sum of stage vectors, taken over
// the non-zero weights only and always left to right, so a generic loop rounds exactly as the
// unrolled formula s·(w_1·v_1 + w_2·v_2 + …) would — and a lone term as (s·w)·v, one rounding less.

/**
 * out = scale·Σ_j weights[j]·vectors[j]; false (and `out` untouched) when every weight is 0.
 */
export function setWeightedSum(out: Float64Array, weights: readonly number[], vectors: readonly Float64Array[], scale = 1): boolean {
  let terms = 0;
  let lone = -1;
  for (let j = 0; j < weights.length; j++) {
    if (weights[j] === 0) continue;
    terms++;
    lone = j;
  }
  if (terms === 0) return false;
  if (terms === 1) {
    const weight = scale * weights[lone];
    const vector = vectors[lone];
    for (let i = 0; i < out.length; i++) out[i] = weight * vector[i];
    return true;
  }
  let written = false;
  for (let j = 0; j < weights.length; j++) {
    const weight = weights[j];
    if (weight === 0) continue;
    const vector = vectors[j];
    if (written) for (let i = 0; i < out.length; i++) out[i] += weight * vector[i];
    else for (let i = 0; i < out.length; i++) out[i] = weight * vector[i];
    written = true;
  }
  if (scale !== 1) for (let i = 0; i < out.length; i++) out[i] *= scale;
  return true;
}

/** out += Σ_j weights[j]·vectors[j], one term after the other. */
export function addWeightedSum(out: Float64Array, weights: readonly number[], vectors: readonly Float64Array[]): void {
  for (let j = 0; j < weights.length; j++) {
    const weight = weights[j];
    if (weight === 0) continue;
    const vector = vectors[j];
    for (let i = 0; i < out.length; i++) out[i] += weight * vector[i];
  }
}
