// What changed between two versions of a mechanism: the text, line by line, and the network's
// invariants in words. Pure, so the History page can run it in the browser.
import { diffLines } from "diff";
import type { AnalysisReport } from "~/chem/analysis";
import type { RoomReport } from "./analysis-map";

/** The invariants stored with every snapshot (snapshots.summary). */
export interface StructureSummary {
  species: number;
  speciesNames: string[];
  complexes: number;
  reactions: number;
  linkageClasses: number;
  rank: number;
  deficiency: number;
  reversible: boolean;
  weaklyReversible: boolean;
  errors: number;
  /** The behaviour verdicts; absent in snapshots stored before they were kept. */
  verdicts?: BehaviourVerdicts;
}

export interface BehaviourVerdicts {
  multistationarity: AnalysisReport["multistationarity"]["verdict"];
  /** The siphon criterion for persistence: holds, fails, or undecided (null). */
  persistence: boolean | null;
  /** Species with absolute concentration robustness. */
  robust: string[];
}

export function summarizeStructure(report: RoomReport): StructureSummary {
  return {
    species: report.species.length,
    speciesNames: report.species,
    complexes: report.complexes.length,
    reactions: report.reactions.length,
    linkageClasses: report.linkageClasses.length,
    rank: report.rank,
    deficiency: report.deficiency,
    reversible: report.reversible,
    weaklyReversible: report.weaklyReversible,
    errors: report.diagnostics.filter((d) => d.severity === "error").length,
    verdicts: {
      multistationarity: report.multistationarity.verdict,
      persistence: report.persistence.criterionHolds,
      robust: report.acr,
    },
  };
}

export interface DiffLine {
  kind: "same" | "added" | "removed";
  text: string;
  /** 1-based line numbers in the older and newer text; null on the side the line is absent from. */
  before: number | null;
  after: number | null;
}

export function diffText(before: string, after: string): DiffLine[] {
  const lines: DiffLine[] = [];
  let beforeLine = 1;
  let afterLine = 1;
  for (const change of diffLines(before, after)) {
    const texts = change.value.replace(/\n$/, "").split("\n");
    for (const text of texts) {
      if (change.added) lines.push({ kind: "added", text, before: null, after: afterLine++ });
      else if (change.removed) lines.push({ kind: "removed", text, before: beforeLine++, after: null });
      else lines.push({ kind: "same", text, before: beforeLine++, after: afterLine++ });
    }
  }
  return lines;
}

const countedInvariants: [keyof StructureSummary, string][] = [
  ["deficiency", "deficiency"],
  ["rank", "rank"],
  ["linkageClasses", "linkage classes"],
  ["species", "species"],
  ["complexes", "complexes"],
  ["reactions", "reactions"],
  ["errors", "errors"],
];

const yesNo = (value: boolean) => (value ? "yes" : "no");

/** Each changed invariant as "deficiency 0 → 1"; empty when the structure is the same. */
export function invariantChanges(before: StructureSummary, after: StructureSummary): string[] {
  const changes: string[] = [];
  for (const [key, words] of countedInvariants) {
    if (before[key] !== after[key]) changes.push(`${words} ${before[key]} → ${after[key]}`);
  }
  if (before.reversible !== after.reversible) changes.push(`reversible ${yesNo(before.reversible)} → ${yesNo(after.reversible)}`);
  if (before.weaklyReversible !== after.weaklyReversible) {
    changes.push(`weakly reversible ${yesNo(before.weaklyReversible)} → ${yesNo(after.weaklyReversible)}`);
  }
  const added = after.speciesNames.filter((name) => !before.speciesNames.includes(name));
  const removed = before.speciesNames.filter((name) => !after.speciesNames.includes(name));
  if (added.length > 0) changes.push(`species added: ${added.join(", ")}`);
  if (removed.length > 0) changes.push(`species removed: ${removed.join(", ")}`);
  if (before.verdicts && after.verdicts) changes.push(...verdictChanges(before.verdicts, after.verdicts));
  return changes;
}

const criterionWords = (holds: boolean | null) => (holds === null ? "undecided" : holds ? "holds" : "fails");
const speciesList = (names: string[]) => (names.length === 0 ? "none" : names.join(", "));

/** Each changed behaviour verdict in words, as "multistationarity excluded → possible". */
function verdictChanges(before: BehaviourVerdicts, after: BehaviourVerdicts): string[] {
  const changes: string[] = [];
  if (before.multistationarity !== after.multistationarity) changes.push(`multistationarity ${before.multistationarity} → ${after.multistationarity}`);
  if (before.persistence !== after.persistence) {
    changes.push(`siphon criterion for persistence ${criterionWords(before.persistence)} → ${criterionWords(after.persistence)}`);
  }
  if (speciesList(before.robust) !== speciesList(after.robust)) {
    changes.push(`robust concentrations ${speciesList(before.robust)} → ${speciesList(after.robust)}`);
  }
  return changes;
}

export function describeInvariantChanges(before: StructureSummary, after: StructureSummary): string {
  const changes = invariantChanges(before, after);
  return changes.length > 0 ? changes.join(", ") : "no change in the invariants";
}

/** True when two summaries describe the same structure (what decides an automatic snapshot). */
export function sameStructure(a: StructureSummary, b: StructureSummary): boolean {
  return invariantChanges(a, b).length === 0;
}
