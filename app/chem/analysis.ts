// The structure report of a mechanism: every invariant the product shows, in one JSON-ready object.
// Its keys are the `analyze --json` contract of PRODUCT.md plus the extras the web UI needs.
import type { AcrWitness } from "./acr";
import { complexBalance, type ComplexBalance } from "./complex-balance";
import { type BalanceReport, elementBalance } from "./balance";
import { detailedBalance, type DetailedBalance } from "./detailed-balance";
import type { Diagnostic, Mechanism, Network, ParseResult, Term } from "./model";
import { buildNetwork, reactionVector } from "./network";
import type { Multistationarity } from "./multistationarity";
import { networkShape, type ShapeMemo } from "./network-shape";
import { inducedOdes } from "./odes";
import { checkSourceLimits, parseMechanism } from "./parse";
import type { TheoremVerdict } from "./theorems";

export interface AnalysisReport {
  diagnostics: Diagnostic[];
  species: string[];
  complexes: string[];
  reactions: { from: number; to: number; rate: number | null }[];
  linkageClasses: number[][];
  strongLinkageClasses: number[][];
  terminalStrongLinkageClasses: number[][];
  rank: number;
  deficiency: number;
  linkageClassDeficiencies: number[];
  reversible: boolean;
  weaklyReversible: boolean;
  conservationLaws: number[][];
  /**
   * The compatibility class of the initial state, where every simulation of it stays: the
   * dimension of the stoichiometric subspace (= rank) and the total each conservation law fixes,
   * its value at the initial concentrations (in the order of `conservationLaws`).
   */
  compatibilityClass: { dimension: number; totals: number[] };
  massConserving: boolean;
  theorems: { deficiencyZero: TheoremVerdict; deficiencyOne: TheoremVerdict };
  odes: Record<string, string>;
  /** Can one compatibility class hold several positive steady states (mass action)? */
  multistationarity: Multistationarity;
  /** Minimal siphons as sorted species names; null when there were too many to list. */
  siphons: string[][] | null;
  /** Species with absolute concentration robustness by the Shinar–Feinberg criterion. */
  acr: string[];
  /**
   * With `balanced` in the text: each step's atoms and charge, right side minus left (a step with a
   * species that has no readable formula is not checked); null when the text does not ask.
   */
  balance: BalanceReport | null;
  // ---- extras for the web UI
  /** The siphon criterion for persistence: whether it holds, the siphons it fails on, in words. */
  persistence: { criterionHolds: boolean | null; uncovered: string[][]; conclusion: string };
  /** The complexes that witness each robust species, and the criterion's verdict in words. */
  robustness: { witnesses: AcrWitness[]; conclusion: string };
  complexBalance: ComplexBalance;
  odesLatex: Record<string, string>;
  /**
   * The stoichiometric matrix by columns: for each reaction its nonzero entries as
   * [species index, coefficient]. Sparse, because every client of a room receives it on each
   * structural change (see stoichiometry.ts for the dense table).
   */
  stoichiometry: [number, number][][];
  detailedBalance: DetailedBalance;
  customLaws: { reaction: number; law: string; lines: number[] }[];
  fixedSpecies: Record<string, number>;
  /** Named rate coefficients and their values: the typeset equations keep the names. */
  parameters: Record<string, number>;
  /** The steps as written, for the graph's species–step view, search and the step under the caret. */
  steps: StepSummary[];
}

/** One step of the text: its species as [species index, coefficient] (fixed species left out). */
export interface StepSummary {
  label: string | null;
  line: number;
  reactants: [number, number][];
  products: [number, number][];
  /** Indices into `reactions` this step contributes to (none when only fixed species change). */
  reactions: number[];
}

export interface AnalysisOptions {
  /** Milliseconds to spend searching for a multistationarity witness; 0 (the default) searches none. */
  witnessSearchMs?: number;
  /** Sample points and progress of that search (see `WitnessSearch`). */
  witnessSamples?: number;
  onWitnessProgress?: (fraction: number) => void;
  /** Remembers the structural part of recent analyses (see network-shape.ts): for a caller that analyses one changing text. */
  shapes?: ShapeMemo;
}

export async function analyzeSource(source: string, options: AnalysisOptions = {}): Promise<AnalysisReport> {
  return analyzeMechanism(parseForAnalysis(source), options);
}

/**
 * The parse the report is computed from; a text over the size limits parses to that one error.
 * `parse` may be an IncrementalMechanismParser's, for a caller that sees one text change often.
 */
export function parseForAnalysis(source: string, parse: (source: string) => ParseResult = parseMechanism): ParseResult {
  const refusal = checkSourceLimits(source);
  if (!refusal) return parse(source);
  const diagnostic: Diagnostic = { severity: "error", line: 1, column: 1, message: refusal, from: 0, to: 0 };
  return { mechanism: { steps: [], species: [], fixed: {}, parameters: {}, initial: {} }, diagnostics: [diagnostic] };
}

export async function analyzeMechanism({ mechanism, diagnostics }: ParseResult, options: AnalysisOptions = {}): Promise<AnalysisReport> {
  const network = buildNetwork(mechanism);
  const { species, complexes, reactions } = network;
  const customLaws = reactions.flatMap((reaction, index) =>
    reaction.law === null ? [] : [{ reaction: index, law: reaction.law, lines: reaction.steps.map((step) => mechanism.steps[step].line) }],
  );
  // A witness search reads the rate coefficients, so its verdict is never taken from the memo.
  const search = { ms: options.witnessSearchMs ?? 0, samples: options.witnessSamples, onProgress: options.onWitnessProgress };
  const shape = await (options.shapes && search.ms <= 0 ? options.shapes.get(network) : networkShape(network, search));
  const { linkage, conservationLaws, stoichiometricRank, deficiency, linkageClassDeficiencies, reversible, weaklyReversible, theorems } = shape;
  const { massConserving, multistationarity, siphonVerdict, robustness } = shape;
  const odes = inducedOdes(network);
  const namesOf = (members: number[]) => members.map((index) => species[index]);

  return {
    diagnostics,
    species,
    complexes: complexes.map((complex) => complex.text),
    reactions: reactions.map(({ from, to, rate }) => ({ from, to, rate })),
    linkageClasses: linkage.linkageClasses,
    strongLinkageClasses: linkage.strongLinkageClasses,
    terminalStrongLinkageClasses: linkage.terminalStrongLinkageClasses,
    rank: stoichiometricRank,
    deficiency,
    linkageClassDeficiencies,
    reversible,
    weaklyReversible,
    conservationLaws,
    compatibilityClass: {
      dimension: stoichiometricRank,
      totals: conservationLaws.map((law) => law.reduce((total, weight, i) => total + weight * (mechanism.initial[species[i]] ?? 0), 0)),
    },
    massConserving,
    theorems,
    odes: odes.text,
    multistationarity,
    siphons: siphonVerdict.siphons?.map(namesOf) ?? null,
    acr: robustness.species,
    balance: elementBalance(mechanism),
    odesLatex: odes.latex,
    stoichiometry: reactions.map((reaction) => {
      const { indices, values } = reactionVector(network, reaction);
      return indices.map((index, k): [number, number] => [index, values[k]]);
    }),
    persistence: {
      criterionHolds: siphonVerdict.criterionHolds,
      uncovered: siphonVerdict.uncovered.map((index) => namesOf(siphonVerdict.siphons![index])),
      conclusion: siphonVerdict.conclusion,
    },
    robustness: { witnesses: robustness.witnesses, conclusion: robustness.conclusion },
    complexBalance: complexBalance(network, { weaklyReversible, linkageClasses: linkage.linkageClasses }),
    detailedBalance: detailedBalance(network, reversible),
    customLaws,
    fixedSpecies: mechanism.fixed,
    parameters: mechanism.parameters,
    steps: stepSummaries(mechanism, network),
  };
}

function stepSummaries(mechanism: Mechanism, network: Network): StepSummary[] {
  const speciesIndex = new Map(network.species.map((name, index) => [name, index]));
  const reactionsOf = mechanism.steps.map((): number[] => []);
  network.reactions.forEach((reaction, index) => reaction.steps.forEach((step) => reactionsOf[step].push(index)));
  // A + A is one entry of coefficient 2, as in the complex.
  const indexed = (terms: Term[]): [number, number][] => {
    const totals = new Map<number, number>();
    for (const { species, coefficient } of terms) {
      const index = speciesIndex.get(species);
      if (index !== undefined) totals.set(index, (totals.get(index) ?? 0) + coefficient);
    }
    return [...totals];
  };
  return mechanism.steps.map((step, index) => ({
    label: step.label,
    line: step.line,
    reactants: indexed(step.reactants),
    products: indexed(step.products),
    reactions: reactionsOf[index],
  }));
}
