// From steps as written to the reaction network of chemical reaction network theory: complexes
// over the non-fixed species and directed reactions between them, duplicates merged.
import { massActionText, monomialText } from "./expression";
import type { SparseVector } from "./linalg/sparse";
import type { ComplexVector, Mechanism, Network, RateFactor, RateRef, Reaction, Step, Term } from "./model";
import { speciesToken } from "./print";
import { evaluateRateExpression, rateExpressionText } from "./rate-expression";

/** One step's contribution to a directed reaction, before duplicates are merged. */
interface Contribution {
  from: number;
  to: number;
  step: number;
  /** Folded numeric coefficient; null when unknown or custom. */
  rate: number | null;
  /** The coefficient's factors, or null for a custom law. */
  factors: RateFactor[] | null;
  law: string | null;
}

export function buildNetwork(mechanism: Mechanism): Network {
  const speciesIndex = new Map(mechanism.species.map((name, index) => [name, index]));
  const complexes: ComplexVector[] = [];
  const complexIndex = new Map<string, number>();
  const complexOf = (complex: ComplexVector): number => {
    let index = complexIndex.get(complex.text);
    if (index === undefined) {
      index = complexes.push(complex) - 1;
      complexIndex.set(complex.text, index);
    }
    return index;
  };

  const contributions: Contribution[] = [];
  mechanism.steps.forEach((step, stepIndex) => {
    const reactants = toComplex(step.reactants, speciesIndex, mechanism.species);
    const products = toComplex(step.products, speciesIndex, mechanism.species);
    if (reactants.text === products.text) return; // only fixed species change: no reaction at all
    // A direction whose coefficient is 0 never runs: the theorems must describe the system that is
    // simulated, so it is no reaction, and its complexes count only if another reaction uses them.
    const [forwardZero, backwardZero] = zeroRateDirections(mechanism, step);
    const backward = step.reversible && !backwardZero;
    if (forwardZero && !backward) return;
    const from = complexOf(reactants);
    const to = complexOf(products);
    if (!forwardZero) contributions.push(contribution(mechanism, step, stepIndex, from, to, "forward"));
    if (backward) contributions.push(contribution(mechanism, step, stepIndex, to, from, "backward"));
  });

  const monomials = complexes.map((complex) => monomialText(complex, mechanism.species));
  return { species: mechanism.species, complexes, reactions: mergeDuplicates(contributions, monomials) };
}

/** The reaction vector y' − y over species indices (zero entries left out). */
export function reactionVector(network: Network, reaction: { from: number; to: number }): SparseVector {
  // Both complexes list their terms by species index, so one merge gives the sorted difference.
  const gained = network.complexes[reaction.to].terms;
  const lost = network.complexes[reaction.from].terms;
  const indices: number[] = [];
  const values: number[] = [];
  let i = 0;
  let j = 0;
  while (i < gained.length || j < lost.length) {
    const a = i < gained.length ? gained[i].species : Infinity;
    const b = j < lost.length ? lost[j].species : Infinity;
    const species = Math.min(a, b);
    const value = (a === species ? gained[i++].coefficient : 0) - (b === species ? lost[j++].coefficient : 0);
    if (value !== 0) {
      indices.push(species);
      values.push(value);
    }
  }
  return { indices, values };
}

function toComplex(terms: Term[], speciesIndex: Map<string, number>, species: string[]): ComplexVector {
  const totals = new Map<number, number>();
  for (const { species: name, coefficient } of terms) {
    const index = speciesIndex.get(name);
    if (index !== undefined) totals.set(index, (totals.get(index) ?? 0) + coefficient);
  }
  const sorted = [...totals].sort(([a], [b]) => a - b).map(([index, coefficient]) => ({ species: index, coefficient }));
  const text =
    sorted.length === 0
      ? "0"
      : sorted.map(({ species: index, coefficient }) => `${coefficient === 1 ? "" : coefficient}${speciesToken(species[index])}`).join(" + ");
  return { text, terms: sorted };
}

/**
 * Whether the step's forward and backward directions have a mass-action coefficient of exactly 0,
 * literal, through a parameter or through a fixed reactant held at 0. A missing coefficient or a
 * custom law is not 0.
 */
export function zeroRateDirections(mechanism: Mechanism, step: Step): [boolean, boolean] {
  return [foldedRate(mechanism, step, "forward") === 0, step.reversible && foldedRate(mechanism, step, "backward") === 0];
}

/** The direction's mass-action coefficient with fixed species folded in; null if unknown or custom. */
function foldedRate(mechanism: Mechanism, step: Step, direction: "forward" | "backward"): number | null {
  if (step.law !== null) return null;
  const ref = direction === "forward" ? step.forward : step.backward;
  let rate = ref ? rateValue(ref, mechanism) : null;
  if (rate === null) return null;
  const consumed = direction === "forward" ? step.reactants : step.products;
  for (const { species, coefficient } of consumed) {
    if (species in mechanism.fixed) rate *= mechanism.fixed[species] ** coefficient;
  }
  return rate;
}

function contribution(
  mechanism: Mechanism,
  step: Step,
  stepIndex: number,
  from: number,
  to: number,
  direction: "forward" | "backward",
): Contribution {
  if (step.law !== null) return { from, to, step: stepIndex, rate: null, factors: null, law: step.law };
  const ref = direction === "forward" ? step.forward : step.backward;
  const consumed = direction === "forward" ? step.reactants : step.products;
  const fixedTerms = consumed.filter((term) => term.species in mechanism.fixed);
  const rate = foldedRate(mechanism, step, direction);
  const factors: RateFactor[] = [
    ref ? rateFactor(ref, mechanism) : { kind: "missing", symbol: placeholder(step, direction), power: 1 },
    ...fixedTerms.map(({ species, coefficient }): RateFactor => ({ kind: "fixed", symbol: species, power: coefficient })),
  ];
  return { from, to, step: stepIndex, rate, factors, law: null };
}

/** The coefficient's number; null when a parameter is missing or an expression has no valid value. */
export function rateValue(ref: RateRef, mechanism: Mechanism): number | null {
  if (ref.kind === "value") return ref.value;
  if (ref.kind === "parameter") return mechanism.parameters[ref.name] ?? null;
  const evaluation = evaluateRateExpression(ref.expression, mechanism.parameters);
  return evaluation.ok && evaluation.value >= 0 ? evaluation.value : null;
}

function rateFactor(ref: RateRef, mechanism: Mechanism): RateFactor {
  if (ref.kind === "value") return { kind: "value", symbol: String(ref.value), power: 1 };
  if (ref.kind === "parameter") return { kind: "parameter", symbol: ref.name, power: 1 };
  const expression = { tree: ref.expression, value: rateValue(ref, mechanism) };
  return { kind: "expression", symbol: rateExpressionText(ref.expression), power: 1, expression };
}

/** A readable stand-in name for a coefficient the author has not given yet. */
function placeholder(step: Step, direction: "forward" | "backward"): string {
  const name = step.label ?? `line${step.line}`;
  if (!step.reversible) return `k_${name}`;
  return `${direction === "forward" ? "kf" : "kb"}_${name}`;
}

function mergeDuplicates(contributions: Contribution[], monomials: string[]): Reaction[] {
  const groups = new Map<string, Contribution[]>();
  for (const part of contributions) {
    const key = `${part.from}>${part.to}`;
    const group = groups.get(key);
    if (group) group.push(part);
    else groups.set(key, [part]);
  }
  return [...groups.values()].map((parts) => {
    const { from, to } = parts[0];
    const steps = parts.map((part) => part.step);
    if (parts.every((part) => part.factors !== null)) {
      const rate = parts.every((part) => part.rate !== null) ? parts.reduce((sum, part) => sum + part.rate!, 0) : null;
      return { from, to, rate, law: null, coefficient: parts.map((part) => part.factors!), steps };
    }
    if (parts.length === 1) return { from, to, rate: null, law: parts[0].law, coefficient: null, steps };
    // A custom law merged with anything becomes one custom law: the sum of every part's rate.
    const law = parts.map((part) => `(${part.law ?? massActionText([part.factors!], monomials[from])})`).join(" + ");
    return { from, to, rate: null, law, coefficient: null, steps };
  });
}
