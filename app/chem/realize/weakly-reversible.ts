// A weakly reversible realization, by repeated dense searches. Method (after Szederkényi, Hangos
// and Tuza 2012, from memory): the dense realization's graph contains every realization on the same
// candidate complexes. In a weakly reversible realization each reaction lies on a cycle, so it lies
// inside one strong component of that graph; reactions joining two different strong components can
// therefore be forbidden and the dense search repeated. When no such reaction is left, the dense
// graph is a union of strong components — weakly reversible. When the search becomes infeasible,
// no weakly reversible realization on these complexes exists — provided each search was optimal
// and no realization needs rates outside the solver's bounds (see milp.ts).
import type { SearchOptions, SearchOutcome } from "./milp";
import { searchRealization } from "./milp";
import type { Edge } from "../linkage";
import type { RealizationProblem } from "./problem";
import { analyzeLinkage } from "../linkage";

export type WeakReversibilityOutcome = SearchOutcome | { status: "undetermined"; reason: string };

export async function searchWeaklyReversible(problem: RealizationProblem, options: SearchOptions): Promise<WeakReversibilityOutcome> {
  const forbidden = new Set(options.forbidden ?? []);
  const cache = options.cache ?? new Map();
  let exact = true;
  for (;;) {
    const outcome = await searchRealization(problem, "dense", { ...options, forbidden, cache, stage: options.stage ?? "weakly reversible" });
    if (outcome.status !== "found") {
      return outcome.status === "infeasible" && !exact
        ? { status: "undetermined", reason: "an earlier dense search stopped at its time limit before proving optimality" }
        : outcome;
    }
    exact &&= outcome.optimal;
    const component = strongComponentOf(problem.complexes.length, outcome.edges);
    const crossing = outcome.edges.filter(({ from, to }) => component[from] !== component[to]);
    if (crossing.length === 0) return outcome;
    for (const { from, to } of crossing) forbidden.add(`${from}>${to}`);
  }
}

/** strongComponentOf[complex] labels its strong linkage class. */
export function strongComponentOf(complexCount: number, edges: Edge[]): number[] {
  const component: number[] = [];
  analyzeLinkage(complexCount, edges).strongLinkageClasses.forEach((members, k) => members.forEach((c) => (component[c] = k)));
  return component;
}
