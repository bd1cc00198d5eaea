// The one kernel of every tableau-driven stage loop: a weighted sum of stage vectors, one per row
// of a tableau. Each row is compiled once into straight-line code (its non-zero weights as
// literals, one pass over the components) — a loop over the weights inside the loop over the
// components ran up to 5× slower, and these sums are a large share of an explicit step. Hosts that
// forbid code generation get the same sums as table-driven loops. Either way a sum adds left to
// right exactly as the unrolled formula base + s·(w_1·v_1 + w_2·v_2 + …) would, and a lone term
// as base + (s·w)·v.

/** out = base + scale·Σ_j w_j·vectors[j] (base null: 0). `out` may be `base`. */
export type ScaledSum = (out: Float64Array, base: Float64Array | null, scale: number, vectors: readonly Float64Array[]) => void;

/** out = base + w_0·vectors[0] + w_1·vectors[1] + …, added one term after the other. */
export type AccumulatedSum = (out: Float64Array, base: Float64Array, vectors: readonly Float64Array[]) => void;

interface Terms {
  readonly indices: Int32Array;
  readonly weights: Float64Array;
}

const scaledCache = new WeakMap<readonly number[], ScaledSum>();
const accumulatedCache = new WeakMap<readonly number[], AccumulatedSum>();

/** `generate: false` gives the table-driven form (what a host without code generation runs). */
export function scaledSum(row: readonly number[], { generate = true } = {}): ScaledSum {
  if (!generate) return tableScaledSum(terms(row));
  let sum = scaledCache.get(row);
  if (!sum) {
    sum = generated<ScaledSum>(["out", "base", "scale", "vectors"], scaledBody(terms(row))) ?? tableScaledSum(terms(row));
    scaledCache.set(row, sum);
  }
  return sum;
}

export function accumulatedSum(row: readonly number[], { generate = true } = {}): AccumulatedSum {
  if (!generate) return tableAccumulatedSum(terms(row));
  let sum = accumulatedCache.get(row);
  if (!sum) {
    sum = generated<AccumulatedSum>(["out", "base", "vectors"], accumulatedBody(terms(row))) ?? tableAccumulatedSum(terms(row));
    accumulatedCache.set(row, sum);
  }
  return sum;
}

function terms(row: readonly number[]): Terms {
  const indices = row.flatMap((weight, j) => (weight === 0 ? [] : [j]));
  return { indices: Int32Array.from(indices), weights: Float64Array.from(indices, (j) => row[j]) };
}

function generated<T>(parameters: string[], body: string): T | null {
  try {
    return new Function(...parameters, body) as T;
  } catch {
    return null; // code generation forbidden here (a strict Content-Security-Policy)
  }
}

/** `w·v[i]` for each term, with the weight as an exact literal (String(x) round-trips a double). */
function products({ indices, weights }: Terms): string[] {
  return Array.from(indices, (j, t) => `(${String(weights[t])}) * v${j}[i]`);
}

function loads({ indices }: Terms): string {
  return Array.from(indices, (j) => `const v${j} = vectors[${j}];`).join("\n");
}

function scaledBody(row: Terms): string {
  const count = row.indices.length;
  if (count === 0) return "if (base) out.set(base); else out.fill(0);";
  const sum = count === 1 ? `w * v${row.indices[0]}[i]` : `scale * (${products(row).join(" + ")})`;
  return [
    loads(row),
    count === 1 ? `const w = scale * (${String(row.weights[0])});` : "",
    "const n = out.length;",
    `if (base) for (let i = 0; i < n; i++) out[i] = base[i] + ${sum};`,
    `else for (let i = 0; i < n; i++) out[i] = ${sum};`,
  ].join("\n");
}

function accumulatedBody(row: Terms): string {
  return [loads(row), "const n = out.length;", `for (let i = 0; i < n; i++) out[i] = ${["base[i]", ...products(row)].join(" + ")};`].join("\n");
}

function tableScaledSum({ indices, weights }: Terms): ScaledSum {
  const count = indices.length;
  return (out, base, scale, vectors) => {
    const n = out.length;
    if (count === 0) {
      if (base) out.set(base);
      else out.fill(0);
      return;
    }
    if (count === 1) {
      const weight = scale * weights[0];
      const vector = vectors[indices[0]];
      for (let i = 0; i < n; i++) out[i] = base ? base[i] + weight * vector[i] : weight * vector[i];
      return;
    }
    for (let i = 0; i < n; i++) {
      let sum = weights[0] * vectors[indices[0]][i];
      for (let t = 1; t < count; t++) sum += weights[t] * vectors[indices[t]][i];
      out[i] = base ? base[i] + scale * sum : scale * sum;
    }
  };
}

function tableAccumulatedSum({ indices, weights }: Terms): AccumulatedSum {
  return (out, base, vectors) => {
    for (let i = 0; i < out.length; i++) {
      let sum = base[i];
      for (let t = 0; t < indices.length; t++) sum += weights[t] * vectors[indices[t]][i];
      out[i] = sum;
    }
  };
}
