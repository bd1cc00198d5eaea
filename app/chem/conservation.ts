// Whether the network conserves mass: some conservation law gives every species a positive weight.
// Decided over the (small) basis of conservation laws, with an LP only when no shortcut settles it:
// find λ with Σ_k λ_k·law_k ≥ 1 for every species.
import loadHighs from "highs";

type Solver = Awaited<ReturnType<typeof loadHighs>>;

let solver: Promise<Solver> | null = null;

/** The LP solver, loaded once per process (its WebAssembly start-up dominates small solves). */
export function loadSolver(): Promise<Solver> {
  solver ??= loadHighs();
  return solver;
}

export async function hasPositiveConservationLaw(laws: number[][], speciesCount: number): Promise<boolean> {
  if (speciesCount === 0 || laws.length === 0) return false;
  for (let species = 0; species < speciesCount; species++) {
    if (laws.every((law) => law[species] === 0)) return false;
  }
  if (laws.some((law) => law.every((weight) => weight > 0))) return true;
  if (laws.some((law) => law.every((weight) => weight < 0))) return true;
  const result = (await loadSolver()).solve(feasibilityProblem(laws, speciesCount), { output_flag: false });
  return result.Status === "Optimal";
}

function feasibilityProblem(laws: number[][], speciesCount: number): string {
  const rows: string[] = [];
  for (let species = 0; species < speciesCount; species++) {
    const terms = laws
      .map((law, k) => (law[species] === 0 ? "" : `${law[species] < 0 ? "-" : "+"} ${Math.abs(law[species])} l${k}`))
      .filter(Boolean);
    rows.push(` s${species}: ${terms.join(" ")} >= 1`);
  }
  const bounds = laws.map((_, k) => ` l${k} free`);
  return ["Minimize", " obj: 0 l0", "Subject To", ...rows, "Bounds", ...bounds, "End"].join("\n");
}
