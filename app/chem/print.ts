// Canonical `.weave` text of a mechanism: what parseMechanism reads back into the same network.
import type { Mechanism, RateRef, Step, Term } from "./model";
import { rateExpressionText } from "./rate-expression";

const identifier = /^[A-Za-z][A-Za-z0-9_]*$/;

/** A species as it must be written: bare when it is an identifier (and not the keyword), else quoted. */
export function speciesToken(name: string): string {
  return identifier.test(name) && name !== "fixed" ? name : `"${name}"`;
}

export function printMechanism(mechanism: Mechanism): string {
  const lines = mechanism.steps.map(printStep);
  const declarations = [
    ...Object.entries(mechanism.parameters).map(([name, value]) => `${name} = ${value}`),
    ...Object.entries(mechanism.initial).map(([name, value]) => `[${speciesToken(name)}]0 = ${value}`),
    ...Object.entries(mechanism.fixed).map(([name, value]) => `fixed [${speciesToken(name)}] = ${value}`),
    ...(mechanism.elementBalance ? ["balanced", ...Object.entries(mechanism.elementBalance.formulas).map(([name, formula]) => `formula [${speciesToken(name)}] = ${speciesToken(formula)}`)] : []),
  ];
  if (declarations.length > 0) lines.push("", ...declarations);
  return lines.join("\n") + "\n";
}

function printStep(step: Step): string {
  const label = step.label ? `${step.label}: ` : "";
  const arrow = step.reversible ? "<=>" : "->";
  return `${label}${printComplex(step.reactants)} ${arrow} ${printComplex(step.products)}${printRates(step)}`;
}

function printComplex(terms: Term[]): string {
  if (terms.length === 0) return "0";
  return terms.map(({ coefficient, species }) => `${coefficient === 1 ? "" : coefficient}${speciesToken(species)}`).join(" + ");
}

function printRates(step: Step): string {
  if (step.law !== null) return ` @ { ${step.law} }`;
  const rates = step.reversible ? [step.forward, step.backward] : [step.forward];
  // A step missing a coefficient is printed without any rather than with an invented one.
  if (rates.some((rate) => rate === null)) return "";
  return ` @ ${(rates as RateRef[]).map(printRate).join(", ")}`;
}

function printRate(rate: RateRef): string {
  if (rate.kind === "expression") return rateExpressionText(rate.expression);
  return rate.kind === "value" ? String(rate.value) : rate.name;
}
