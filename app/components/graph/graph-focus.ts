// Search and focus: what a reader can look for in the graph (a species or a step, by name or label),
// and the neighbourhood a found item lights up — its steps, their reactions and complexes, and the
// species they touch — while the rest is dimmed. Pure functions of the analysis report.
import type { CaretStep } from "~/components/editor/caret-step";
import type { ComplexGraphReport } from "./graph-model";

export type { CaretStep };

export type FocusTarget = { kind: "species" | "step"; index: number };

export interface SearchEntry extends FocusTarget {
  /** A species' name, or a step's label ("line 12" for a step without one). */
  name: string;
}

export interface Neighbourhood {
  species: ReadonlySet<number>;
  steps: ReadonlySet<number>;
  complexes: ReadonlySet<number>;
  reactions: ReadonlySet<number>;
}

/** What the graph stresses: the focused neighbourhood (all else dims) and the caret's step. */
export interface Emphasis {
  focus: Neighbourhood | null;
  caret: Neighbourhood | null;
  /** The focused species or step itself, the middle of its neighbourhood. */
  focused: FocusTarget | null;
  /** Changes whenever the reader focuses something, so the view can centre on it. */
  focusKey: string;
  /** Changes whenever the caret reaches another step, so the view can follow it; empty without one. */
  caretKey: string;
}

const shownMatches = 12;

export function searchEntries(report: ComplexGraphReport): SearchEntry[] {
  const species = (report.species ?? []).map((name, index): SearchEntry => ({ kind: "species", index, name }));
  const steps = (report.steps ?? []).map(({ label, line }, index): SearchEntry => ({ kind: "step", index, name: label ?? `line ${line}` }));
  return [...species, ...steps];
}

/** Entries matching the query, case-insensitively: exact names first, then prefixes, then the rest. */
export function findEntries(entries: readonly SearchEntry[], query: string): SearchEntry[] {
  const wanted = query.trim().toLowerCase();
  if (!wanted) return [];
  const rank = (name: string) => {
    const lower = name.toLowerCase();
    return lower === wanted ? 0 : lower.startsWith(wanted) ? 1 : lower.includes(wanted) ? 2 : 3;
  };
  return entries
    .map((entry) => ({ entry, rank: rank(entry.name) }))
    .filter(({ rank }) => rank < 3)
    .sort((a, b) => a.rank - b.rank || a.entry.name.length - b.entry.name.length)
    .slice(0, shownMatches)
    .map(({ entry }) => entry);
}

/**
 * A step's neighbourhood is its species, reactions and their complexes; a species' is every step
 * it takes part in, with those steps' neighbourhoods.
 */
export function neighbourhood(report: ComplexGraphReport, target: FocusTarget): Neighbourhood {
  const steps = report.steps ?? [];
  const stepIndices =
    target.kind === "step"
      ? [target.index].filter((index) => index < steps.length)
      : steps.flatMap(({ reactants, products }, index) => ([...reactants, ...products].some(([species]) => species === target.index) ? [index] : []));
  const species = new Set(target.kind === "species" ? [target.index] : []);
  const reactions = new Set<number>();
  const complexes = new Set<number>();
  for (const index of stepIndices) {
    const { reactants, products, reactions: own } = steps[index];
    for (const [each] of [...reactants, ...products]) species.add(each);
    for (const reaction of own) {
      reactions.add(reaction);
      const { from, to } = report.reactions[reaction] ?? {};
      if (from !== undefined) complexes.add(from).add(to);
    }
  }
  return { species, steps: new Set(stepIndices), complexes, reactions };
}

/**
 * The step under the caret, found by label (which survives edits above it) and, for a step without
 * one, by line. Null when the caret is not in a step the report knows.
 */
export function caretStepIndex(report: ComplexGraphReport, caret: CaretStep | null): number | null {
  if (!caret) return null;
  const steps = report.steps ?? [];
  const index = caret.label === null ? steps.findIndex(({ label, line }) => label === null && line === caret.line) : steps.findIndex(({ label }) => label === caret.label);
  return index < 0 ? null : index;
}
