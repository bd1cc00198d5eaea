// Sparse and dense dynamically equivalent realizations by mixed-integer linear programming, after
// Szederkényi (2009, 2010; "Computing sparse and dense realizations of reaction kinetic systems",
// J. Math. Chem.). Unknowns: the off-diagonal Kirchhoff entries a_ij ≥ 0 (rate of y_j → y_i) and
// binaries δ_ij with ε·δ_ij ≤ a_ij ≤ U·δ_ij (big-M); constraint Y·A_k = M; objective min Σδ (sparse)
// or max Σδ (dense). Column j of Y·A_k = M reads Σ_i a_ij (y_i − y_j) = M_j and involves only the
// reactions out of y_j, so the problem splits into one small MILP per source complex — the same
// optimum, found far faster. The solver's rates are then snapped to exact rationals.
import highsLoader from "highs";
import * as P from "../ode/polynomial";
import * as Q from "../linalg/rational";
import type { Rational } from "../linalg/rational";
import { snapToExact } from "./exact-solve";
import type { Edge } from "../linkage";
import type { MassActionMechanism, MassActionReaction } from "./mass-action";
import { inducedRhs } from "./mass-action";
import type { RealizationProblem } from "./problem";

export type Objective = "sparse" | "dense";

export interface SearchProgress {
  stage: string;
  /** Source complexes done out of all. */
  done: number;
  total: number;
}

export interface SearchOptions {
  /** Reactions j → i not to use, as `${j}>${i}` over candidate complex indices. */
  forbidden?: ReadonlySet<string>;
  /** Wall-clock instant (ms since epoch) after which the search gives up. */
  deadline: number;
  onProgress?: (progress: SearchProgress) => void;
  stage?: string;
  /** Shared between searches on one problem, so a repeated search re-solves only changed columns. */
  cache?: ColumnCache;
}

/** Solved columns by objective, source complex and the reactions forbidden out of it. */
export type ColumnCache = Map<string, ColumnOutcome>;

export type SearchOutcome =
  | { status: "found"; mechanism: MassActionMechanism; edges: Edge[]; optimal: boolean }
  | { status: "infeasible" }
  | { status: "time-limit" };

/**
 * Rates are solved for after scaling each column so that max |M_j| = 1, where these bounds mean
 * "at most 10⁴ times the column's largest coefficient" and "a reaction counts from 10⁻⁴ of it".
 * The solver's feasibility tolerance must stay far below LOWER, or δ = 1 with a = 0 passes.
 */
const UPPER = 1e4;
const LOWER = 1e-4;
const TOLERANCE = 1e-9;
/**
 * A dense realization's rates are far from unique and the MILP leaves them at its bounds (10⁴,
 * 10⁻⁴). On the chosen reactions an LP then looks for the smallest total rate with every rate at
 * least 1/100 of the column's largest coefficient, which reads better; if there is none, the MILP's
 * rates stay.
 */
const TIDY_FLOOR = 1e-2;

/** Loaded once (the WebAssembly module is large); a failed load is retried on the next search. */
let solver: ReturnType<typeof highsLoader> | null = null;
const loadSolver = () =>
  (solver ??= highsLoader().catch((error: unknown) => {
    solver = null;
    throw error;
  }));

export async function searchRealization(problem: RealizationProblem, objective: Objective, options: SearchOptions): Promise<SearchOutcome> {
  const highs = await loadSolver();
  const m = problem.complexes.length;
  const reactions: MassActionReaction[] = [];
  const edges: Edge[] = [];
  let optimal = true;
  for (let j = 0; j < m; j++) {
    const remaining = (options.deadline - Date.now()) / 1000;
    if (remaining <= 0) return { status: "time-limit" };
    const forbidden = options.forbidden ?? new Set<string>();
    const key = `${objective}:${j}:${[...forbidden].filter((f) => f.startsWith(`${j}>`)).sort().join(" ")}`;
    const column = options.cache?.get(key) ?? solveColumn(highs, problem, j, objective, forbidden, remaining);
    if (column !== "time-limit") options.cache?.set(key, column);
    if (column === "infeasible" || column === "time-limit") return { status: column };
    optimal &&= column.optimal;
    for (const [i, rate] of column.rates) {
      reactions.push({ reactant: problem.complexes[j], product: problem.complexes[i], rate });
      edges.push({ from: j, to: i });
    }
    options.onProgress?.({ stage: options.stage ?? objective, done: j + 1, total: m });
    // Lets progress reach the caller between the (synchronous) solver calls.
    await new Promise((resolve) => setTimeout(resolve, 0));
  }
  const mechanism = { species: [...problem.species], reactions };
  const rhs = inducedRhs(mechanism);
  const expected = problem.species.map((_, s) =>
    P.fromTerms(problem.complexes.map((c, j) => ({ exponents: c, coefficient: problem.targets[j][s] }))),
  );
  if (!rhs.every((p, s) => P.equals(p, expected[s]))) throw new Error("internal error: the realization does not reproduce the ODE");
  return { status: "found", mechanism, edges, optimal };
}

type Highs = Awaited<ReturnType<typeof highsLoader>>;
type ColumnOutcome = { rates: Map<number, Rational>; optimal: boolean } | "infeasible" | "time-limit";

function solveColumn(
  highs: Highs,
  problem: RealizationProblem,
  j: number,
  objective: Objective,
  forbidden: ReadonlySet<string>,
  seconds: number,
): ColumnOutcome {
  const source = problem.complexes[j];
  const target = problem.targets[j];
  const scale = target.reduce((max, t) => Math.max(max, Math.abs(Q.toNumber(t))), 0) || 1;
  const candidates = problem.complexes
    .map((complex, i) => ({ i, vector: complex.map((e, s) => e - source[s]) }))
    .filter(({ i }) => i !== j && !forbidden.has(`${j}>${i}`));
  if (objective === "sparse" && target.every(Q.isZero)) return { rates: new Map(), optimal: true };
  if (candidates.length === 0) return target.every(Q.isZero) ? { rates: new Map(), optimal: true } : "infeasible";

  const options = {
    time_limit: seconds,
    output_flag: false,
    mip_feasibility_tolerance: TOLERANCE,
    primal_feasibility_tolerance: TOLERANCE,
  };
  const scaled = target.map((t) => Q.toNumber(t) / scale);
  const model = columnModel(candidates, scaled, objective);
  let solution = highs.solve(model, options);
  // HiGHS's MIP presolve has called a feasible column infeasible (a dense search out of a complex
  // whose target is zero, where no reaction at all is a solution): that verdict is confirmed
  // without presolve.
  if (solution.Status === "Infeasible") solution = highs.solve(model, { ...options, presolve: "off" });
  if (solution.Status === "Infeasible") return "infeasible";
  const values = candidates.map((_, k) => solution.Columns[`a${k}`]?.Primal);
  if (values.some((v) => typeof v !== "number")) return solution.Status === "Time limit reached" ? "time-limit" : "infeasible";
  const chosen = candidates.filter((_, k) => values[k]! > LOWER / 2);
  let approximate = chosen.map((c) => values[candidates.indexOf(c)]!);
  if (objective === "dense" && chosen.length > 0) {
    const tidy = highs.solve(columnModel(chosen, scaled, "tidy"), options);
    if (tidy.Status === "Optimal") approximate = chosen.map((_, k) => tidy.Columns[`a${k}`].Primal);
  }
  const rates = snapColumn(
    chosen.map((c) => c.vector),
    target,
    approximate.map((v) => v * scale),
  );
  if (!rates) throw new Error(`the solver's rates out of complex ${j} could not be made exact`);
  return { rates: new Map(chosen.flatMap((c, k) => (Q.sign(rates[k]) > 0 ? [[c.i, rates[k]]] : []))), optimal: solution.Status === "Optimal" };
}

/** Exact rates on the chosen support; one retry without reactions that snapped to zero or below. */
function snapColumn(vectors: number[][], target: Rational[], approximate: number[]): Rational[] | null {
  const first = snapToExact(vectors, target, approximate);
  if (!first || first.every((r) => Q.sign(r) > 0)) return first;
  const keep = first.map((r) => Q.sign(r) > 0);
  const second = snapToExact(vectors.filter((_, k) => keep[k]), target, approximate.filter((_, k) => keep[k]));
  if (!second || second.some((r) => Q.sign(r) <= 0)) return null;
  let next = 0;
  return keep.map((kept) => (kept ? second[next++] : Q.ZERO));
}

/** The column's MILP (or, for "tidy", the LP over the chosen reactions) in CPLEX LP format. */
function columnModel(candidates: { vector: number[] }[], target: number[], objective: Objective | "tidy"): string {
  const all = (name: string) => candidates.map((_, k) => `${name}${k}`);
  const lines = [objective === "dense" ? "Maximize" : "Minimize", ` obj: ${all(objective === "tidy" ? "a" : "d").join(" + ")}`, "Subject To"];
  target.forEach((t, s) => {
    const terms = candidates.flatMap((c, k) => (c.vector[s] === 0 ? [] : [`${c.vector[s] < 0 ? "-" : "+"} ${Math.abs(c.vector[s])} a${k}`]));
    if (terms.length > 0 || t !== 0) lines.push(` m${s}: ${terms.length ? terms.join(" ") : "0 a0"} = ${t}`);
  });
  if (objective === "tidy") {
    lines.push("Bounds", ...all("a").map((a) => ` ${TIDY_FLOOR} <= ${a} <= ${UPPER}`), "End");
    return lines.join("\n");
  }
  candidates.forEach((_, k) => {
    lines.push(` u${k}: a${k} - ${UPPER} d${k} <= 0`);
    if (objective === "dense") lines.push(` l${k}: a${k} - ${LOWER} d${k} >= 0`);
  });
  lines.push("Bounds", ...all("a").map((a) => ` 0 <= ${a} <= ${UPPER}`), "Binary", ...all("d").map((d) => ` ${d}`), "End");
  return lines.join("\n");
}
