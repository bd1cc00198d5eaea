// What the Deficiency Zero and Deficiency One Theorems (Horn, Jackson, Feinberg) say about a
// network, in words for a chemist. Both concern mass-action kinetics with any positive rate
// coefficients; "compatibility class" means all compositions reachable with the same conserved totals.
import { listed } from "./listed";

export interface TheoremVerdict {
  /** Whether the theorem's hypotheses hold, so that its conclusion is guaranteed. */
  applies: boolean;
  conclusion: string;
}

export interface StructureFacts {
  reactionCount: number;
  deficiency: number;
  linkageClassDeficiencies: number[];
  /** Number of terminal strong linkage classes inside each linkage class. */
  terminalClassesPerLinkageClass: number[];
  weaklyReversible: boolean;
  /** Reactions whose rate is a custom law rather than mass action. */
  customLawCount: number;
}

export function deficiencyZeroTheorem(facts: StructureFacts): TheoremVerdict {
  if (facts.reactionCount === 0) return { applies: false, conclusion: "There are no reactions yet, so there is nothing to conclude." };
  if (facts.deficiency !== 0) {
    return {
      applies: false,
      conclusion: `The deficiency is ${facts.deficiency}, not 0, so this theorem draws no conclusion: depending on the rate coefficients the network might have several steady states or oscillate.`,
    };
  }
  const conclusion = facts.weaklyReversible
    ? "Deficiency 0 and weakly reversible: whatever the rate coefficients, every compatibility class with positive concentrations has exactly one positive steady state. It is complex balanced and asymptotically stable, and no trajectory with all concentrations positive can oscillate. Multiple steady states, sustained oscillation and chaos in the positive region are ruled out."
    : "Deficiency 0 but not weakly reversible: whatever the rate coefficients, there is no steady state with every concentration positive, and no periodic trajectory with every concentration positive: the network cannot settle at, or cycle through, a state where every species is present.";
  return { applies: true, conclusion: withMassActionCaveat(conclusion, facts) };
}

/** How many classes a failed hypothesis names before it counts the rest. */
const FAILURES_NAMED = 6;

export function deficiencyOneTheorem(facts: StructureFacts): TheoremVerdict {
  if (facts.reactionCount === 0) return { applies: false, conclusion: "There are no reactions yet, so there is nothing to conclude." };
  const failures: string[] = [];
  // Class numbers, 1-based, of the classes that break each hypothesis.
  const tooDeficient = facts.linkageClassDeficiencies.flatMap((deficiency, index) => (deficiency > 1 ? [index] : []));
  if (tooDeficient.length === 1) {
    const [index] = tooDeficient;
    failures.push(`linkage class ${index + 1} has deficiency ${facts.linkageClassDeficiencies[index]} (at most 1 is allowed)`);
  } else if (tooDeficient.length > 1) {
    failures.push(`${tooDeficient.length} linkage classes have deficiency above 1 (at most 1 is allowed): classes ${listed(tooDeficient.map((index) => `${index + 1} (${facts.linkageClassDeficiencies[index]})`), FAILURES_NAMED)}`);
  }
  const sum = facts.linkageClassDeficiencies.reduce((total, deficiency) => total + deficiency, 0);
  if (sum !== facts.deficiency) {
    failures.push(`the linkage classes' deficiencies add up to ${sum}, not to the network's deficiency ${facts.deficiency}`);
  }
  const counts = facts.terminalClassesPerLinkageClass;
  const notOneTerminal = counts.flatMap((count, index) => (count !== 1 ? [index] : []));
  if (notOneTerminal.length === 1) {
    const [index] = notOneTerminal;
    failures.push(`linkage class ${index + 1} has ${counts[index]} terminal strong linkage classes (exactly 1 is required)`);
  } else if (notOneTerminal.length > 1) {
    failures.push(`${notOneTerminal.length} linkage classes have more than one terminal strong linkage class (exactly 1 is required): classes ${listed(notOneTerminal.map((index) => `${index + 1} (${counts[index]})`), FAILURES_NAMED)}`);
  }
  if (failures.length > 0) {
    return { applies: false, conclusion: `Its hypotheses do not hold: ${failures.join("; ")}. The theorem draws no conclusion.` };
  }
  const existence = facts.weaklyReversible
    ? " Because the network is weakly reversible, such a steady state always exists, so every compatibility class with positive concentrations has exactly one."
    : "";
  const zero = facts.deficiency === 0 ? " (The deficiency is 0, so the Deficiency Zero Theorem says more.)" : "";
  const conclusion = `Its hypotheses hold: whatever the rate coefficients, if there is one steady state with every concentration positive, then each compatibility class with positive concentrations holds exactly one, so multiple positive steady states within a class are ruled out.${existence}${zero}`;
  return { applies: true, conclusion: withMassActionCaveat(conclusion, facts) };
}

function withMassActionCaveat(conclusion: string, facts: StructureFacts): string {
  if (facts.customLawCount === 0) return conclusion;
  const reactions = facts.customLawCount === 1 ? "1 reaction uses" : `${facts.customLawCount} reactions use`;
  return `${conclusion} This holds for mass-action kinetics; ${reactions} a custom rate law, so it does not cover the model as written.`;
}
