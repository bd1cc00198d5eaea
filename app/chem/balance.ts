// Element balance: whether each step keeps its atoms and its charge. A species' formula is its
// declared one or else its name read as a formula; a species a step leaves unchanged (a third body
// M on both sides) needs none. A step with a species that has no readable formula is not checked,
// so abstract networks (X, Y, Z) are never judged.
import { type Formula, readFormula } from "./formula";
import type { Mechanism, Step } from "./model";

export interface StepBalance {
  /** Index into Mechanism.steps. */
  step: number;
  line: number;
  label: string | null;
  /** False when a species the step changes has no readable formula. */
  checked: boolean;
  /** Right side minus left side, per element; only the elements that differ. */
  atoms: Record<string, number>;
  /** Right side minus left side. */
  charge: number;
  /** The difference in words; null when the step balances or is not checked. */
  message: string | null;
}

export interface BalanceReport {
  /** Species whose formula a step needs but whose name is not a formula and was not declared. */
  unreadable: string[];
  steps: StepBalance[];
}

/** The element balance of every step, when the mechanism turns it on; null when it does not. */
export function elementBalance(mechanism: Mechanism): BalanceReport | null {
  if (!mechanism.elementBalance) return null;
  const formulas = new FormulaBook(mechanism.elementBalance.formulas);
  const unreadable = new Set<string>();
  const steps = mechanism.steps.map((step, index): StepBalance => {
    const sides = stepSides(step, formulas);
    const base = { step: index, line: step.line, label: step.label };
    if (sides.unreadable.length > 0) {
      for (const name of sides.unreadable) unreadable.add(name);
      return { ...base, checked: false, atoms: {}, charge: 0, message: null };
    }
    const atoms: Record<string, number> = {};
    for (const element of new Set([...Object.keys(sides.left.atoms), ...Object.keys(sides.right.atoms)])) {
      const difference = (sides.right.atoms[element] ?? 0) - (sides.left.atoms[element] ?? 0);
      if (difference !== 0) atoms[element] = difference;
    }
    const charge = sides.right.charge - sides.left.charge;
    return { ...base, checked: true, atoms, charge, message: imbalanceMessage(atoms, sides.left.charge, sides.right.charge) };
  });
  return { unreadable: [...unreadable], steps };
}

/** Formulas by species name, each read once. */
class FormulaBook {
  private readonly read = new Map<string, Formula | null>();

  constructor(private readonly declared: Record<string, string>) {}

  formulaOf(species: string): Formula | null {
    if (!this.read.has(species)) {
      const reading = readFormula(this.declared[species] ?? species);
      this.read.set(species, reading.ok ? reading.formula : null);
    }
    return this.read.get(species)!;
  }
}

/**
 * The atoms and charge of each side as written. A spectator (as many on both sides, such as a third
 * body M) cancels out, so it needs no readable formula: without one it is left off both sides.
 */
function stepSides(step: Step, formulas: FormulaBook): { left: Formula; right: Formula; unreadable: string[] } {
  const counts = new Map<string, { left: number; right: number }>();
  const count = (species: string) => counts.get(species) ?? counts.set(species, { left: 0, right: 0 }).get(species)!;
  for (const { species, coefficient } of step.reactants) count(species).left += coefficient;
  for (const { species, coefficient } of step.products) count(species).right += coefficient;
  const left: Formula = { atoms: {}, charge: 0 };
  const right: Formula = { atoms: {}, charge: 0 };
  const unreadable: string[] = [];
  for (const [species, { left: onLeft, right: onRight }] of counts) {
    const formula = formulas.formulaOf(species);
    if (formula) {
      addTo(left, formula, onLeft);
      addTo(right, formula, onRight);
    } else if (onLeft !== onRight) {
      unreadable.push(species);
    }
  }
  return { left, right, unreadable };
}

function addTo(side: Formula, formula: Formula, times: number): void {
  for (const [element, count] of Object.entries(formula.atoms)) side.atoms[element] = (side.atoms[element] ?? 0) + times * count;
  side.charge += times * formula.charge;
}

/** "2 H short on the right; charge +1 on the left, 0 on the right", or null when balanced. */
export function imbalanceMessage(atoms: Record<string, number>, leftCharge: number, rightCharge: number): string | null {
  const parts = Object.entries(atoms).map(([element, difference]) => `${Math.abs(difference)} ${element} short on the ${difference < 0 ? "right" : "left"}`);
  const atomsText = parts.join(", ");
  const chargeText = leftCharge === rightCharge ? "" : `charge ${chargeWords(leftCharge)} on the left, ${chargeWords(rightCharge)} on the right`;
  const said = [atomsText, chargeText].filter((text) => text !== "");
  return said.length === 0 ? null : `Not balanced: ${said.join("; ")}.`;
}

function chargeWords(charge: number): string {
  return charge > 0 ? `+${charge}` : String(charge);
}
