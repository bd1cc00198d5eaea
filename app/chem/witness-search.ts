// The multistationarity witness search with a longer budget than the analysis on every change
// allows: the queued job behind the Structure panel's "run it". Beside the verdict it returns what
// anyone checks a witness by: each steady state's residual and its conserved totals.
import { analyzeMechanism } from "./analysis";
import { MAX_WITNESS_JOB_SAMPLES } from "./limits";
import type { Mechanism } from "./model";
import { relativeResidual, type Multistationarity } from "./multistationarity";
import { buildNetwork } from "./network";

export interface WitnessCheck {
  /** The largest |dX/dt| at the state relative to the largest reaction rate there. */
  residual: number;
  /** Each conservation law's total at the state, in the order of `conservationLaws`. */
  totals: number[];
}

export interface WitnessSearchResult {
  multistationarity: Multistationarity;
  /** The searched text's reactions ("A + B → C"), in the order of the witness's rates. */
  reactions: string[];
  species: string[];
  conservationLaws: number[][];
  /** One per steady state of the witness; empty without one. */
  checks: WitnessCheck[];
}

export async function searchWitness(mechanism: Mechanism, { budgetMs, onProgress }: { budgetMs: number; onProgress?: (fraction: number) => void }): Promise<WitnessSearchResult> {
  const report = await analyzeMechanism(
    { mechanism, diagnostics: [] },
    { witnessSearchMs: budgetMs, witnessSamples: MAX_WITNESS_JOB_SAMPLES, onWitnessProgress: onProgress },
  );
  const network = buildNetwork(mechanism);
  const { multistationarity, conservationLaws, species } = report;
  const checks = (multistationarity.witness?.equilibria ?? []).map((equilibrium): WitnessCheck => {
    const state = species.map((name) => equilibrium[name]);
    return {
      residual: relativeResidual(network, multistationarity.witness!.rates, state),
      totals: conservationLaws.map((law) => law.reduce((total, weight, s) => total + weight * state[s], 0)),
    };
  });
  const reactions = report.reactions.map(({ from, to }) => `${report.complexes[from]} → ${report.complexes[to]}`);
  return { multistationarity, reactions, species, conservationLaws, checks };
}
