// Compiles a kinetic right-hand side, y' = S·r(y), into fast code. Rates r are mass-action
// monomials k·∏y^p (analytic Jacobian) or custom laws (Jacobian by finite differences). Both a
// mechanism and a polynomial ODE reduce to this form. Small systems get straight-line code from
// `new Function` (no loops, no indirection); larger ones, or hosts that forbid code generation (a
// strict Content-Security-Policy), use table-driven loops over typed arrays instead.

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
  readonly sparsity: readonly (readonly number[])[];
  /** The rate tables when every rate is a monomial (what the WebAssembly engine runs on); null with custom laws. */
  readonly massAction: MassActionTables | null;
}

/** A kinetic system's structure as compressed tables (rates numbered monomials first, then custom laws). */
export interface MassActionTables {
  /** Factors of monomial j: factorStart[j] … factorStart[j + 1] − 1. */
  factorStart: Int32Array;
  factorVariable: Int32Array;
  factorPower: Float64Array;
  /** y'_i = Σ variableChange[e]·r[variableRate[e]] over e in variableStart[i] … variableStart[i + 1] − 1. */
  variableStart: Int32Array;
  variableRate: Int32Array;
  variableChange: Float64Array;
  /** The changes rate j makes: rateStart[j] … rateStart[j + 1] − 1. */
  rateStart: Int32Array;
  rateVariable: Int32Array;
  rateChange: Float64Array;
}

/**
 * Longest generated function body, in characters. V8 optimises a function only after a number of
 * calls that grows with its size, so a big straight-line kernel runs interpreted for most of a
 * simulation — boxing every intermediate, with the garbage collector running hot — while the
 * table-driven loops are optimised almost at once. Measured on a 200-species network (bodies of
 * 13–40 kB): generated code made the whole run 2.5× slower; below a few kB it is the faster one.
 */
const GENERATED_CODE_LIMIT = 5_000;

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
  const tables = massActionTables(spec);
  const fast = options.generate ?? true ? generatedKernels(spec) : {};
  const kernels: Kernels = { ...tableKernels(n, tables), ...fast };
  const generated = Object.keys(fast).length > 0;

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
    massAction: spec.custom.length === 0 ? tables : null,
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

/** Straight-line code for each kernel whose body stays within the size limit (none where forbidden). */
function generatedKernels(spec: KineticSpec): Partial<Kernels> {
  const n = spec.names.length;
  const rates = spec.monomials.map((m, j) => `r[${j}]=${monomialCode(j, m.factors)};`);

  const sums = new Map<number, string[]>();
  for (const { variable, rate, change } of spec.changes) {
    const list = sums.get(variable) ?? [];
    list.push(`${change}*r[${rate}]`);
    sums.set(variable, list);
  }
  const scatter = spec.names.map((_, i) => `dy[${i}]=${(sums.get(i) ?? ["0"]).join("+")};`);

  // ∂r_j/∂y_a once per (rate, factor) into the scratch array p (typed-array stores keep the
  // function small for the optimiser), then each Jacobian entry as one sum of change·partial.
  const partials: string[] = [];
  const entries = new Map<number, string[]>();
  const changes = changesByRate(spec, spec.monomials.length + spec.custom.length);
  spec.monomials.forEach((m, j) => {
    m.factors.forEach((f, index) => {
      const others = m.factors.filter((_, other) => other !== index);
      const slot = partials.length;
      const own = f.power === 1 ? [] : [`${f.power}`, powerCode(f.variable, f.power - 1)];
      partials.push(`p[${slot}]=${[`k[${j}]`, ...own, ...others.map((o) => powerCode(o.variable, o.power))].join("*")};`);
      for (const { variable, change } of changes[j]) {
        const entry = variable * n + f.variable;
        const list = entries.get(entry) ?? [];
        list.push(`${change}*p[${slot}]`);
        entries.set(entry, list);
      }
    });
  });
  const jacobian = [...entries].map(([entry, list]) => `J[${entry}]=${list.join("+")};`);
  const scratch = new Float64Array(partials.length);

  const bodies = {
    rates: rates.join("\n"),
    scatter: scatter.join("\n"),
    monomialJacobian: `J.fill(0);\n${partials.join("\n")}\n${jacobian.join("\n")}`,
  };
  const kernels: Partial<Kernels> = {};
  try {
    if (bodies.rates.length <= GENERATED_CODE_LIMIT) kernels.rates = new Function("k", "y", "r", bodies.rates) as Kernels["rates"];
    if (bodies.scatter.length <= GENERATED_CODE_LIMIT) kernels.scatter = new Function("r", "dy", bodies.scatter) as Kernels["scatter"];
    if (bodies.monomialJacobian.length <= GENERATED_CODE_LIMIT) {
      const jacobianWith = new Function("k", "y", "J", "p", bodies.monomialJacobian);
      kernels.monomialJacobian = (k, y, J) => jacobianWith(k, y, J, scratch);
    }
  } catch {
    return {}; // code generation forbidden here: the table-driven kernels do the same work
  }
  return kernels;
}

function massActionTables(spec: KineticSpec): MassActionTables {
  const monomialCount = spec.monomials.length;
  const factorStart = new Int32Array(monomialCount + 1);
  spec.monomials.forEach((m, j) => (factorStart[j + 1] = factorStart[j] + m.factors.length));
  const factorVariable = new Int32Array(factorStart[monomialCount]);
  const factorPower = new Float64Array(factorVariable.length);
  spec.monomials.forEach((m, j) =>
    m.factors.forEach((f, index) => {
      factorVariable[factorStart[j] + index] = f.variable;
      factorPower[factorStart[j] + index] = f.power;
    }),
  );
  const byVariable = compressed(spec.names.length, spec.changes.map((c) => [c.variable, c.rate, c.change]));
  const byRate = compressed(monomialCount + spec.custom.length, spec.changes.map((c) => [c.rate, c.variable, c.change]));
  return {
    factorStart,
    factorVariable,
    factorPower,
    variableStart: byVariable.start,
    variableRate: byVariable.index,
    variableChange: byVariable.value,
    rateStart: byRate.start,
    rateVariable: byRate.index,
    rateChange: byRate.value,
  };
}

function tableKernels(n: number, tables: MassActionTables): Kernels {
  const { factorStart, factorVariable, factorPower, variableStart, variableRate, variableChange, rateStart, rateVariable, rateChange } = tables;
  const monomialCount = factorStart.length - 1;

  return {
    rates(k, y, r) {
      for (let j = 0; j < monomialCount; j++) {
        let value = k[j];
        const end = factorStart[j + 1];
        for (let f = factorStart[j]; f < end; f++) value *= power(y[factorVariable[f]], factorPower[f]);
        r[j] = value;
      }
    },
    scatter(r, dy) {
      for (let i = 0; i < n; i++) {
        let sum = 0;
        const end = variableStart[i + 1];
        for (let e = variableStart[i]; e < end; e++) sum += variableChange[e] * r[variableRate[e]];
        dy[i] = sum;
      }
    },
    monomialJacobian(k, y, jacobian) {
      jacobian.fill(0);
      for (let j = 0; j < monomialCount; j++) {
        const first = factorStart[j];
        const end = factorStart[j + 1];
        for (let f = first; f < end; f++) {
          const a = factorVariable[f];
          const p = factorPower[f];
          let partial = p === 1 ? k[j] : k[j] * p * power(y[a], p - 1);
          for (let g = first; g < end; g++) if (g !== f) partial *= power(y[factorVariable[g]], factorPower[g]);
          const changesEnd = rateStart[j + 1];
          for (let e = rateStart[j]; e < changesEnd; e++) jacobian[rateVariable[e] * n + a] += rateChange[e] * partial;
        }
      }
    },
  };
}

function power(value: number, p: number): number {
  return p === 1 ? value : p === 2 ? value * value : Math.pow(value, p);
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
