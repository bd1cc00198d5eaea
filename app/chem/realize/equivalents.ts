// Other mechanisms with the same mass-action ODE: the sparse (fewest reactions), the dense (most
// reactions) and a weakly reversible one, on candidate complexes chosen as the canonical
// realization's plus any given (e.g. a mechanism's own). One time limit for the three searches.
import type { ExactOde } from "../ode/exact";
import type { Rational } from "../linalg/rational";
import { buildNetwork } from "../network";
import { parseMechanism } from "../parse";
import { complexesOf, massActionOf } from "./from-network";
import { inducedRhs, maxOrder } from "./mass-action";
import type { MassActionMechanism } from "./mass-action";
import type { SearchProgress } from "./milp";
import { searchRealization } from "./milp";
import { realizationProblem } from "./problem";
import { RealizeRequestError } from "./request-error";
import { searchWeaklyReversible } from "./weakly-reversible";
import type { WeakReversibilityOutcome } from "./weakly-reversible";
import { mechanismText } from "./weave-text";

export interface EquivalentOptions {
  extraComplexes?: number[][];
  /** For all three searches together; default 20 s. */
  timeLimitMs?: number;
  onProgress?: (progress: SearchProgress) => void;
}

export interface EquivalentRealization {
  /** found, infeasible (none exists on these complexes), time-limit, or undetermined. */
  status: WeakReversibilityOutcome["status"];
  mechanism?: string;
  reactions?: number;
  maxOrder?: number;
  /** False when a time limit stopped the solver before it proved its objective optimal. */
  optimal?: boolean;
  reason?: string;
}

export interface EquivalentRealizations {
  complexes: number;
  sparse: EquivalentRealization;
  dense: EquivalentRealization;
  weaklyReversible: EquivalentRealization;
}

export async function equivalentRealizations(
  ode: Pick<ExactOde, "variables" | "rhs"> & { initial?: Rational[] },
  { extraComplexes = [], timeLimitMs = 20_000, onProgress }: EquivalentOptions = {},
): Promise<EquivalentRealizations> {
  const problem = realizationProblem(ode, extraComplexes);
  const deadline = Date.now() + timeLimitMs;
  const describe = (outcome: WeakReversibilityOutcome, heading: string): EquivalentRealization => {
    if (outcome.status !== "found") return { status: outcome.status, ...("reason" in outcome ? { reason: outcome.reason } : {}) };
    const { mechanism } = outcome;
    return {
      status: "found",
      mechanism: mechanismText(mechanism, heading, ode.initial),
      reactions: mechanism.reactions.length,
      maxOrder: maxOrder(mechanism),
      optimal: outcome.optimal,
    };
  };
  // The weakly reversible search starts from the dense one; the cache saves solving it twice.
  const cache = new Map();
  const sparse = await searchRealization(problem, "sparse", { deadline, onProgress, stage: "sparse" });
  const dense = await searchRealization(problem, "dense", { deadline, onProgress, stage: "dense", cache });
  const weaklyReversible = await searchWeaklyReversible(problem, { deadline, onProgress, stage: "weakly reversible", cache });
  return {
    complexes: problem.complexes.length,
    sparse: describe(sparse, "sparse realization: the fewest reactions with the same mass-action ODE"),
    dense: describe(dense, "dense realization: the most reactions with the same mass-action ODE"),
    weaklyReversible: describe(weaklyReversible, "weakly reversible realization with the same mass-action ODE"),
  };
}

/**
 * The same search for a `.weave` mechanism's induced ODE, with its own complexes as candidates.
 * Throws RealizeRequestError for a mechanism with errors, custom rate laws or missing rates.
 */
export async function equivalentRealizationsOfMechanism(source: string, options: EquivalentOptions = {}): Promise<EquivalentRealizations> {
  const { mechanism, diagnostics } = parseMechanism(source);
  const error = diagnostics.find((d) => d.severity === "error");
  if (error) throw new RealizeRequestError(`line ${error.line}: ${error.message}`);
  const network = buildNetwork(mechanism);
  let massAction: MassActionMechanism;
  try {
    massAction = massActionOf(network);
  } catch (cause) {
    throw new RealizeRequestError((cause as Error).message);
  }
  return equivalentRealizations(
    { variables: massAction.species, rhs: inducedRhs(massAction) },
    { ...options, extraComplexes: [...complexesOf(network), ...(options.extraComplexes ?? [])] },
  );
}
