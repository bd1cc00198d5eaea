// Compiles a kinetic right-hand side, y' = S·r(y), into fast code. Rates r are mass-action
// monomials k·∏y^p (analytic Jacobian) or custom laws (Jacobian by finite differences). Both a
// mechanism and a polynomial ODE reduce to this form. Small and medium systems get straight-line
// code from `new Function` (no loops, no indirection); very large systems, or hosts that forbid
// code generation (a strict Content-Security-Policy), use the table-driven evaluator instead.

import type { OdeSystem } from "./ode-system";

export interface MonomialRate {
  /** Coefficient k of the rate k·∏ y[variable]^power. */
  coefficient: number;
  factors: { variable: number; power: number }[];
}

export interface CustomRate {
  evaluate(y: Float64Array): number;
  /** Variables the law reads: only these columns need finite differences. */
  dependsOn: number[];
}

export interface KineticSpec {
  names: string[];
  initial: number[];
  nonNegative: boolean;
  monomials: MonomialRate[];
  custom: CustomRate[];
  /** y'[variable] += change · r[rate]; rates are numbered monomials first, then custom laws. */
  changes: { variable: number; rate: number; change: number }[];
}

export interface KineticSystem extends OdeSystem {
  /** The monomial coefficients, live: a sweep may change them without recompiling. */
  readonly coefficients: Float64Array;
  readonly generated: boolean;
}

/** Above this many terms the generated function gets too big for V8 to optimise well. */
const GENERATED_TERM_LIMIT = 20_000;

interface Kernels {
  rates(k: Float64Array, y: Float64Array, r: Float64Array): void;
  scatter(r: Float64Array, dy: Float64Array): void;
  monomialJacobian(k: Float64Array, y: Float64Array, jacobian: Float64Array): void;
}

export function compileKineticSystem(spec: KineticSpec, options: { generate?: boolean } = {}): KineticSystem {
  const n = spec.names.length;
  const monomialCount = spec.monomials.length;
  const rateCount = monomialCount + spec.custom.length;
  const coefficients = Float64Array.from(spec.monomials, (m) => m.coefficient);
  const terms = spec.changes.length + spec.monomials.reduce((sum, m) => sum + m.factors.length, 0);
  let kernels: Kernels | null = null;
  if ((options.generate ?? true) && terms <= GENERATED_TERM_LIMIT) kernels = generatedKernels(spec);
  const generated = kernels !== null;
  kernels ??= tableKernels(spec);

  const r = new Float64Array(rateCount);
  const rateChanges = changesByRate(spec, rateCount);
  const shifted = new Float64Array(n);

  function customRates(y: Float64Array, into: Float64Array): void {
    for (let c = 0; c < spec.custom.length; c++) into[monomialCount + c] = spec.custom[c].evaluate(y);
  }

  return {
    names: spec.names,
    initial: Float64Array.from(spec.initial),
    nonNegative: spec.nonNegative,
    sparsity: jacobianPattern(spec, rateChanges),
    coefficients,
    generated,
    rhs(y, dy) {
      kernels.rates(coefficients, y, r);
      customRates(y, r);
      kernels.scatter(r, dy);
    },
    jacobian(y, jacobian) {
      kernels.monomialJacobian(coefficients, y, jacobian);
      if (spec.custom.length === 0) return;
      shifted.set(y);
      for (let c = 0; c < spec.custom.length; c++) {
        const law = spec.custom[c];
        const base = law.evaluate(y);
        for (const a of law.dependsOn) {
          const delta = Math.sqrt(Number.EPSILON) * Math.max(Math.abs(y[a]), 1e-8);
          shifted[a] = y[a] + delta;
          const slope = (law.evaluate(shifted) - base) / delta;
          shifted[a] = y[a];
          for (const { variable, change } of rateChanges[monomialCount + c]) jacobian[variable * n + a] += change * slope;
        }
      }
    },
  };
}

/** ∂f_i/∂y_a can be non-zero only where a rate that reads y_a changes y_i. */
function jacobianPattern(spec: KineticSpec, rateChanges: { variable: number }[][]): number[][] {
  const rows = spec.names.map(() => new Set<number>());
  const reads = [...spec.monomials.map((m) => m.factors.map((f) => f.variable)), ...spec.custom.map((c) => c.dependsOn)];
  reads.forEach((variables, rate) => {
    for (const { variable } of rateChanges[rate]) for (const a of variables) rows[variable].add(a);
  });
  return rows.map((row) => [...row].sort((a, b) => a - b));
}

function changesByRate(spec: KineticSpec, rateCount: number): { variable: number; change: number }[][] {
  const byRate: { variable: number; change: number }[][] = Array.from({ length: rateCount }, () => []);
  for (const { variable, rate, change } of spec.changes) byRate[rate].push({ variable, change });
  return byRate;
}

/** y^p as code: repeated products for small integer powers (exact and faster than Math.pow). */
function powerCode(variable: number, power: number): string {
  if (power === 0) return "1";
  if (Number.isInteger(power) && power > 0 && power <= 4) return Array(power).fill(`y[${variable}]`).join("*");
  return `Math.pow(y[${variable}],${power})`;
}

function monomialCode(rate: number, factors: { variable: number; power: number }[]): string {
  return [`k[${rate}]`, ...factors.map((f) => powerCode(f.variable, f.power))].join("*");
}

function generatedKernels(spec: KineticSpec): Kernels | null {
  const n = spec.names.length;
  const rates = spec.monomials.map((m, j) => `r[${j}]=${monomialCode(j, m.factors)};`);

  const sums = new Map<number, string[]>();
  for (const { variable, rate, change } of spec.changes) {
    const list = sums.get(variable) ?? [];
    list.push(`${change}*r[${rate}]`);
    sums.set(variable, list);
  }
  const scatter = spec.names.map((_, i) => `dy[${i}]=${(sums.get(i) ?? ["0"]).join("+")};`);

  // ∂r_j/∂y_a once per (rate, factor), then each Jacobian entry as one sum of change·partial.
  const partials: string[] = [];
  const entries = new Map<number, string[]>();
  const changes = changesByRate(spec, spec.monomials.length + spec.custom.length);
  spec.monomials.forEach((m, j) => {
    m.factors.forEach((f, index) => {
      const others = m.factors.filter((_, other) => other !== index);
      const name = `d${j}_${f.variable}`;
      const own = f.power === 1 ? [] : [`${f.power}`, powerCode(f.variable, f.power - 1)];
      partials.push(`const ${name}=${[`k[${j}]`, ...own, ...others.map((o) => powerCode(o.variable, o.power))].join("*")};`);
      for (const { variable, change } of changes[j]) {
        const entry = variable * n + f.variable;
        const list = entries.get(entry) ?? [];
        list.push(`${change}*${name}`);
        entries.set(entry, list);
      }
    });
  });
  const jacobian = [...entries].map(([entry, list]) => `J[${entry}]=${list.join("+")};`);

  try {
    return {
      rates: new Function("k", "y", "r", rates.join("\n")) as Kernels["rates"],
      scatter: new Function("r", "dy", scatter.join("\n")) as Kernels["scatter"],
      monomialJacobian: new Function("k", "y", "J", `J.fill(0);\n${partials.join("\n")}\n${jacobian.join("\n")}`) as Kernels["monomialJacobian"],
    };
  } catch {
    return null; // code generation forbidden here: the table-driven kernels do the same work
  }
}

function tableKernels(spec: KineticSpec): Kernels {
  const n = spec.names.length;
  const rateCount = spec.monomials.length + spec.custom.length;
  const factorStart = new Int32Array(spec.monomials.length + 1);
  spec.monomials.forEach((m, j) => (factorStart[j + 1] = factorStart[j] + m.factors.length));
  const factorVariable = new Int32Array(factorStart[spec.monomials.length]);
  const factorPower = new Float64Array(factorVariable.length);
  spec.monomials.forEach((m, j) =>
    m.factors.forEach((f, index) => {
      factorVariable[factorStart[j] + index] = f.variable;
      factorPower[factorStart[j] + index] = f.power;
    }),
  );
  const byVariable = compressed(n, spec.changes.map((c) => [c.variable, c.rate, c.change]));
  const byRate = compressed(rateCount, spec.changes.map((c) => [c.rate, c.variable, c.change]));

  const power = (value: number, p: number) => (p === 1 ? value : p === 2 ? value * value : Math.pow(value, p));
  return {
    rates(k, y, r) {
      for (let j = 0; j < spec.monomials.length; j++) {
        let value = k[j];
        for (let f = factorStart[j]; f < factorStart[j + 1]; f++) value *= power(y[factorVariable[f]], factorPower[f]);
        r[j] = value;
      }
    },
    scatter(r, dy) {
      for (let i = 0; i < n; i++) {
        let sum = 0;
        for (let e = byVariable.start[i]; e < byVariable.start[i + 1]; e++) sum += byVariable.value[e] * r[byVariable.index[e]];
        dy[i] = sum;
      }
    },
    monomialJacobian(k, y, jacobian) {
      jacobian.fill(0);
      for (let j = 0; j < spec.monomials.length; j++) {
        for (let f = factorStart[j]; f < factorStart[j + 1]; f++) {
          const a = factorVariable[f];
          const p = factorPower[f];
          let partial = k[j] * (p === 1 ? 1 : p * power(y[a], p - 1));
          for (let g = factorStart[j]; g < factorStart[j + 1]; g++) if (g !== f) partial *= power(y[factorVariable[g]], factorPower[g]);
          for (let e = byRate.start[j]; e < byRate.start[j + 1]; e++) jacobian[byRate.index[e] * n + a] += byRate.value[e] * partial;
        }
      }
    },
  };
}

/** Compressed rows: entries [row, index, value] grouped by row. */
function compressed(rows: number, entries: [number, number, number][]) {
  const start = new Int32Array(rows + 1);
  for (const [row] of entries) start[row + 1]++;
  for (let i = 0; i < rows; i++) start[i + 1] += start[i];
  const fill = start.slice(0, rows);
  const index = new Int32Array(entries.length);
  const value = new Float64Array(entries.length);
  for (const [row, column, amount] of entries) {
    index[fill[row]] = column;
    value[fill[row]++] = amount;
  }
  return { start, index, value };
}
