// Conditions on the rate coefficients of a weakly reversible mass-action network for complex
// balance (Horn 1972; Feinberg 1979 lectures; Craciun, Dickenstein, Shiu and Sturmfels 2009).
// Each complex y gets its tree constant K(y): the sum, over spanning trees of its linkage class
// directed towards y, of the product of the trees' rate coefficients (by the Matrix-Tree theorem, a
// principal minor of the class's Laplacian). The system is complex balanced exactly when
// Π K(y)^α(y) = 1 for every integer α with Σ α(y)·y = 0 and α summing to 0 on each linkage class:
// δ independent conditions, none when the deficiency δ is 0.
import { det } from "mathjs";
import { nullSpace } from "./linalg/kernel";
import type { SparseVector } from "./linalg/sparse";
import type { Network } from "./model";

export interface ComplexBalanceCondition {
  /** Π K(y)^α(y) on each side, e.g. "K(2A)*K(B)^2 = K(2B)*K(A)^2". */
  text: string;
  /** Whether the given coefficients satisfy it; null when some coefficient has no value. */
  satisfied: boolean | null;
}

export interface ComplexBalance {
  /** Only weakly reversible networks with mass-action rates can be complex balanced. */
  applicable: boolean;
  note: string;
  /** Each complex's tree constant at the given coefficients (null where one is missing), in complex order. */
  treeConstants: (number | null)[];
  conditions: ComplexBalanceCondition[];
  /** All conditions hold for the given coefficients; null if not applicable or not all known. */
  satisfied: boolean | null;
}

interface Facts {
  weaklyReversible: boolean;
  linkageClasses: number[][];
}

export function complexBalance(network: Network, facts: Facts): ComplexBalance {
  const none = (note: string): ComplexBalance => ({ applicable: false, note, treeConstants: [], conditions: [], satisfied: null });
  if (network.reactions.length === 0) return none("There are no reactions yet.");
  if (!facts.weaklyReversible) return none("Complex balance needs every reaction to lie on a directed cycle (weak reversibility); this network is not weakly reversible, so no coefficients make it complex balanced.");
  if (network.reactions.some((reaction) => reaction.law !== null)) {
    return none("Complex balance conditions are stated for mass-action rates; some reactions use a custom rate law.");
  }

  const treeConstants = treeConstantsOf(network, facts.linkageClasses);
  const exponents = balanceExponents(network, facts.linkageClasses);
  const conditions = exponents.map((alpha) => condition(network, treeConstants, alpha));
  const satisfied = conditions.some((entry) => entry.satisfied === null) ? null : conditions.every((entry) => entry.satisfied);
  const definition = "K(y) is the tree constant of complex y: the sum, over the spanning trees of its linkage class directed towards y, of the product of their rate coefficients (Matrix-Tree theorem).";
  const note =
    conditions.length === 0
      ? "Weakly reversible with deficiency 0: every choice of rate coefficients gives a complex balanced system (Horn 1972), with exactly one positive steady state in each compatibility class, asymptotically stable."
      : `Weakly reversible with deficiency ${conditions.length}: the system is complex balanced exactly when ${conditions.length === 1 ? "this condition holds" : `these ${conditions.length} conditions hold`}, one per independent relation among the complexes. ${definition} When they hold, each compatibility class has exactly one positive steady state, and it is asymptotically stable.`;
  return { applicable: true, note, treeConstants, conditions, satisfied };
}

/** K(y) for every complex, from each linkage class's Laplacian; null in a class with a missing coefficient. */
function treeConstantsOf(network: Network, linkageClasses: number[][]): (number | null)[] {
  const constants: (number | null)[] = network.complexes.map(() => null);
  for (const members of linkageClasses) {
    const position = new Map(members.map((complex, index) => [complex, index]));
    const laplacian = members.map(() => members.map(() => 0));
    let known = true;
    for (const { from, to, rate } of network.reactions) {
      const i = position.get(from);
      if (i === undefined) continue;
      if (rate === null) known = false;
      laplacian[i][i] += rate ?? 0;
      laplacian[i][position.get(to)!] -= rate ?? 0;
    }
    if (!known) continue;
    members.forEach((complex, i) => {
      const minor = laplacian.filter((_, row) => row !== i).map((row) => row.filter((_, column) => column !== i));
      constants[complex] = minor.length === 0 ? 1 : (det(minor) as number);
    });
  }
  return constants;
}

/** A basis of the integer α over complexes with Σ α(y)·y = 0 and zero sum on each linkage class. */
function balanceExponents(network: Network, linkageClasses: number[][]): number[][] {
  const rows: SparseVector[] = network.species.map((_, species) => {
    const indices: number[] = [];
    const values: number[] = [];
    network.complexes.forEach((complex, index) => {
      const term = complex.terms.find((entry) => entry.species === species);
      if (term) {
        indices.push(index);
        values.push(term.coefficient);
      }
    });
    return { indices, values };
  });
  for (const members of linkageClasses) {
    const indices = [...members].sort((a, b) => a - b);
    rows.push({ indices, values: indices.map(() => 1) });
  }
  return nullSpace(rows, network.complexes.length);
}

function condition(network: Network, treeConstants: (number | null)[], alpha: number[]): ComplexBalanceCondition {
  const side = (sign: 1 | -1) =>
    alpha
      .flatMap((power, complex) => (power * sign > 0 ? [`K(${network.complexes[complex].text})${Math.abs(power) === 1 ? "" : `^${Math.abs(power)}`}`] : []))
      .join("*") || "1";
  let left = 0;
  let right = 0;
  let known = true;
  alpha.forEach((power, complex) => {
    if (power === 0) return;
    const constant = treeConstants[complex];
    if (constant === null || !(constant > 0)) known = false;
    else if (power > 0) left += power * Math.log(constant);
    else right -= power * Math.log(constant);
  });
  // Tree constants come from measured decimals and a floating-point determinant: equal to a relative 1e-9.
  const satisfied = known ? Math.abs(left - right) <= 1e-9 * Math.max(1, Math.abs(left) + Math.abs(right)) : null;
  return { text: `${side(1)} = ${side(-1)}`, satisfied };
}
