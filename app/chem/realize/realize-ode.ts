// From a polynomial ODE text to a mechanism: parse, check for negative cross effects, optionally
// translate and multiply by the product of the variables, realize canonically, and (on request)
// search for sparse, dense and weakly reversible equivalents. The CLI and the API return this object.
import type { Diagnostic } from "../model";
import type { NegativeCrossEffect } from "../ode/cross-effects";
import { negativeCrossEffects } from "../ode/cross-effects";
import type { ExactOde } from "../ode/exact";
import { toPolynomialOde } from "../ode/exact";
import { formatMonomial, formatOde } from "../ode/format";
import { parseOde } from "../ode/parse";
import type { SourceSpan } from "../ode/parse";
import * as P from "../ode/polynomial";
import * as Q from "../linalg/rational";
import { boundingBox, DEFAULT_HORIZON, suggestShift } from "../ode/suggest-shift";
import type { Horizon, ShiftSuggestion } from "../ode/suggest-shift";
import { rescaledHorizon } from "../ode/time-scale";
import { multiplyByMonomial, productOfAllVariables, smallestMultiplier, translate } from "../ode/transform";
import { readComplexes } from "./candidate-complexes";
import { canonicalRealization } from "./canonical";
import type { EquivalentOptions, EquivalentRealizations } from "./equivalents";
import { equivalentRealizations } from "./equivalents";
import { maxOrder } from "./mass-action";
import { RealizeRequestError } from "./request-error";
import { mechanismText } from "./weave-text";

export interface RealizeOdeRequest {
  ode: string;
  /** A translation vector by variable (missing ones are 0), or "suggested" for one read off a simulation. */
  shift?: Record<string, number> | "suggested";
  /** Multiply every right-hand side by the product of all variables (true) or by x^exponents. */
  multiply?: boolean | Record<string, number>;
  /** Simulated interval behind a suggested or checked shift (default 0..50). */
  until?: number;
  /** Also search for sparse, dense and weakly reversible realizations. */
  equivalents?: boolean | EquivalentOptions;
  /** Extra candidate complexes for that search, as written in a mechanism (`2y`, `x + y`). */
  complexes?: string[];
}

export interface CrossEffectReport {
  equation: string;
  term: string;
  /** Where the term was written (the summands that produce it); empty after a transformation. */
  spans: SourceSpan[];
}

export interface RealizeOdeResult {
  /** Of the ODE that is realized, i.e. after the transformations asked for. */
  kinetic: boolean;
  negativeCrossEffects: CrossEffectReport[];
  /** `.weave` text of the canonical realization, or null when the ODE is not kinetic. */
  mechanism: string | null;
  /** Largest total degree of a reactant complex; null without a mechanism. */
  maxOrder: number | null;
  reactions: number | null;
  diagnostics: Diagnostic[];
  /** The ODE as given, when transformations were applied. */
  original?: { kinetic: boolean; negativeCrossEffects: CrossEffectReport[]; degree: number };
  /** Offered whenever the given ODE is not kinetic or a suggested shift was asked for. */
  suggestedShift?: Record<string, number> | null;
  boundingBox?: Record<string, { min: number; max: number }>;
  /**
   * When the ODE still has negative cross effects after the translation asked for (or, when none was
   * asked for, after the suggested one): the lowest-degree monomial that removes them.
   */
  suggestedMultiplier?: Record<string, number>;
  /** After a multiplication: the mechanism runs on another clock (see ode/time-scale.ts). */
  clock?: Clock;
  transformations: (
    | { kind: "translation"; shift: Record<string, number> }
    | { kind: "multiplication"; monomial: string; exponents: Record<string, number> }
  )[];
  transformedOde?: string;
  /** Plain statements of what the transformations do and do not establish. */
  notes: string[];
  equivalents?: EquivalentRealizations;
}

/** The multiplied system's time s and the ODE's time t satisfy dt = multiplier · ds. */
export interface Clock {
  multiplier: string;
  /** The ODE's horizon (the `until` of the request, default 50). */
  originalUntil: number;
  /** The mechanism's end time that covers it; null when no positive multiplier value is known. */
  suggestedUntil: number | null;
  /** How suggestedUntil was found: along the simulated trajectory, or from the initial state alone. */
  basis: "trajectory" | "initial state" | null;
}

export { RealizeRequestError };

export async function realizeOde(request: RealizeOdeRequest): Promise<RealizeOdeResult> {
  const parsed = parseOde(request.ode);
  const result: RealizeOdeResult = {
    kinetic: false,
    negativeCrossEffects: [],
    mechanism: null,
    maxOrder: null,
    reactions: null,
    diagnostics: parsed.diagnostics,
    transformations: [],
    notes: [],
  };
  if (!parsed.exact) return result;
  const given = parsed.exact;
  const givenEffects = negativeCrossEffects(given, parsed.sources).map(report);
  const horizon = { ...DEFAULT_HORIZON, until: request.until ?? DEFAULT_HORIZON.until };

  const suggestion = givenEffects.length > 0 || request.shift === "suggested" ? offerShift(given, horizon, request, result) : null;
  const { ode, shift } = transform(given, request, suggestion, horizon, result);
  const transformed = result.transformations.length > 0;
  if (transformed) {
    const box = suggestion?.box ?? boundingBoxOrNull(given, horizon);
    result.notes.push(orthantNote(given, shift, box, horizon.until));
    result.original = { kinetic: givenEffects.length === 0, negativeCrossEffects: givenEffects, degree: degree(given) };
    result.transformedOde = formatOde(ode);
  }
  result.negativeCrossEffects = transformed ? negativeCrossEffects(ode).map(report) : givenEffects;
  result.kinetic = result.negativeCrossEffects.length === 0;
  if (!result.kinetic) {
    result.notes.push(
      "By the theorem of Hárs and Tóth (1979) an ODE with a negative cross effect is the mass-action ODE of no mechanism; a translation followed by multiplication by a monomial (the suggested one, or the product of the variables) removes every such term.",
    );
    return result;
  }

  const mechanism = canonicalRealization(ode);
  result.mechanism = mechanismText(mechanism, heading(result), ode.initial);
  result.maxOrder = maxOrder(mechanism);
  result.reactions = mechanism.reactions.length;
  if (transformed) {
    result.notes.push(`Cost: ${result.reactions} steps of order up to ${result.maxOrder}, for an ODE of degree ${degree(given)}.`);
  }
  if (request.equivalents) {
    const options = request.equivalents === true ? {} : request.equivalents;
    const extra = readComplexes(request.complexes ?? [], ode.variables);
    result.equivalents = await equivalentRealizations(ode, { ...options, extraComplexes: [...(options.extraComplexes ?? []), ...extra] });
  }
  return result;
}

/** A shift read off a simulation; recorded in the result, or its failure in the notes. */
function offerShift(given: ExactOde, horizon: Horizon, request: RealizeOdeRequest, result: RealizeOdeResult): ShiftSuggestion | null {
  try {
    const suggestion = suggestShift(toPolynomialOde(given), horizon);
    if (given.initial.every(Q.isZero)) {
      result.notes.push("No initial values were given, so the suggested shift is read off the trajectory that starts at 0.");
    }
    result.suggestedShift = suggestion.shift;
    result.boundingBox = suggestion.box;
    return suggestion;
  } catch (error) {
    if (request.shift === "suggested") throw new RealizeRequestError(`no suggested shift: ${(error as Error).message}`);
    result.suggestedShift = null;
    result.notes.push(`No shift could be suggested: ${(error as Error).message}.`);
    return null;
  }
}

/** Applies the translation, then the multiplication, recording each and the smallest multiplier. */
function transform(given: ExactOde, request: RealizeOdeRequest, suggestion: ShiftSuggestion | null, horizon: Horizon, result: RealizeOdeResult) {
  let ode = given;
  let shift = given.variables.map(() => Q.ZERO);
  if (request.shift !== undefined) {
    shift = request.shift === "suggested" ? suggestion!.exact : shiftVector(given, request.shift);
    ode = translate(ode, shift);
    result.transformations.push({ kind: "translation", shift: Object.fromEntries(given.variables.map((v, i) => [v, Q.toNumber(shift[i])])) });
  }
  // A shift brings cross effects of its own (Lorenz: none in x' before, -70 after), so the
  // multiplier is offered for the ODE the user will multiply: the shifted one, by the shift
  // asked for or else the one suggested alongside.
  const toMultiply = request.shift === undefined && suggestion ? translate(given, suggestion.exact) : ode;
  if (negativeCrossEffects(toMultiply).length > 0) {
    const smallest = smallestMultiplier(toMultiply);
    result.suggestedMultiplier = Object.fromEntries(ode.variables.flatMap((v, i) => (smallest[i] ? [[v, smallest[i]]] : [])));
  }
  if (request.multiply) {
    const exponents = request.multiply === true ? productOfAllVariables(ode) : exponentVector(ode, request.multiply);
    result.clock = clock(ode, exponents, horizon.until);
    ode = multiplyByMonomial(ode, exponents);
    const monomial = formatMonomial(exponents, ode.variables);
    result.transformations.push({
      kind: "multiplication",
      monomial,
      exponents: Object.fromEntries(ode.variables.flatMap((v, i) => (exponents[i] ? [[v, exponents[i]]] : []))),
    });
    result.notes.push(
      `Multiplying by ${monomial}, positive inside the positive orthant, changes only the time scale there: the orbits are the same, traversed at another speed. Outside the orthant the two systems differ.`,
      clockNote(result.clock),
    );
  }
  return { ode, shift };
}

/** The multiplied system's clock, with the end time that covers the (translated) ODE's horizon. */
function clock(ode: ExactOde, exponents: number[], until: number): Clock {
  const horizon = rescaledHorizon(ode, exponents, until);
  return { multiplier: formatMonomial(exponents, ode.variables), originalUntil: until, suggestedUntil: horizon?.until ?? null, basis: horizon?.basis ?? null };
}

/** An end time as a person would type it (two significant digits; the JSON keeps the full value). */
const readableTime = (t: number) => String(Number(t.toPrecision(2)));

/** The clock in words, for the notes, the CLI and the mechanism's heading. */
function clockNote({ multiplier, originalUntil, suggestedUntil, basis }: Clock): string {
  const relation = `The mechanism runs on another clock: its time s and the ODE's time t satisfy dt = ${multiplier} · ds, so one unit of s covers ${multiplier} units of t.`;
  if (suggestedUntil === null) return `${relation} No end time could be estimated: the multiplier is not positive at the initial state.`;
  const how =
    basis === "trajectory"
      ? `the integral of dt / (${multiplier}) along the simulated trajectory`
      : `${originalUntil} divided by ${multiplier} at the initial state, a rough estimate since the trajectory could not be followed inside the orthant`;
  return `${relation} Simulate it until s = ${readableTime(suggestedUntil)} to cover the ODE's 0 ≤ t ≤ ${originalUntil} (${how}).`;
}

function shiftVector(ode: ExactOde, shift: Record<string, number>) {
  const unknown = Object.keys(shift).filter((name) => !ode.variables.includes(name));
  if (unknown.length > 0) throw new RealizeRequestError(`the shift names ${unknown.join(", ")}, which the ODE does not have`);
  return ode.variables.map((v) => {
    const value = Object.hasOwn(shift, v) ? shift[v] : 0;
    if (!Number.isFinite(value)) throw new RealizeRequestError(`the shift of ${v} is not a number`);
    return Q.fromNumber(value);
  });
}

function exponentVector(ode: ExactOde, exponents: Record<string, number>) {
  const unknown = Object.keys(exponents).filter((name) => !ode.variables.includes(name));
  if (unknown.length > 0) throw new RealizeRequestError(`the multiplier names ${unknown.join(", ")}, which the ODE does not have`);
  const vector = ode.variables.map((v) => (Object.hasOwn(exponents, v) ? exponents[v] : 0));
  if (!vector.every((e) => Number.isInteger(e) && e >= 0)) throw new RealizeRequestError("the multiplier's exponents must be non-negative integers");
  if (vector.every((e) => e === 0)) throw new RealizeRequestError("the multiplier must contain a variable");
  return vector;
}

function boundingBoxOrNull(ode: ExactOde, horizon: Horizon) {
  try {
    return boundingBox(toPolynomialOde(ode), horizon);
  } catch {
    return null;
  }
}

/** States what the simulation showed about the (shifted) trajectory, and that it is no proof. */
function orthantNote(ode: ExactOde, shift: Q.Rational[], box: Record<string, { min: number; max: number }> | null, until: number): string {
  const orthant = shift.some((s) => !Q.isZero(s)) ? "the shifted positive orthant" : "the positive orthant";
  const limit = `That the trajectory stays bounded inside ${orthant} is only supported numerically, not proved`;
  if (!box) return `${limit}; here not even that: the trajectory could not be simulated.`;
  const leaving = ode.variables.filter((v, i) => box[v].min + Q.toNumber(shift[i]) <= 0);
  return leaving.length === 0
    ? `${limit}: the simulated trajectory from the initial values stays in it for 0 ≤ t ≤ ${until}.`
    : `${limit}, and here the simulated trajectory leaves it (in ${leaving.join(", ")}) before t = ${until}: the mechanism does not reproduce it.`;
}

function heading(result: RealizeOdeResult): string {
  const steps = result.transformations.map((t) =>
    t.kind === "translation"
      ? `translation by ${Object.entries(t.shift).map(([v, s]) => `${v} → ${v} + ${s}`).join(", ")}`
      : `multiplication by ${t.monomial}`,
  );
  const title = `canonical realization: one step per term of the ODE${steps.length ? ` after ${steps.join(" and ")}` : ""}`;
  return result.clock ? `${title}\n${clockNote(result.clock)}` : title;
}

const degree = (ode: ExactOde) => Math.max(0, ...ode.rhs.flatMap((p) => [...p.values()].map((t) => P.totalDegree(t.exponents))));

/** The JSON-safe part of a cross effect (its exact coefficient is a bigint rational). */
function report({ equation, term, spans }: NegativeCrossEffect): CrossEffectReport {
  return { equation, term, spans };
}
