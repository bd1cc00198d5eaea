// The volume a stochastic run starts with when the reader has not chosen one: copy numbers are
// n = round(c·V), so a volume of 100 turns 1e-4 mol/L into no molecules at all. The default puts a
// few hundred copies of the scarcest species present, unless that makes the whole system too large
// for an exact method to finish.
import { DEFAULT_EVENTS_PER_RUN } from "~/chem/limits";

/** The scarcest species present starts with more than 200 and at most 500 copies (a 1-2-5 volume). */
const scarcestCopies = 500;
/**
 * Copies of every species together at most: an exact run fires every event, and a run within the
 * default event budget should see each molecule react about ten times.
 */
export const MAX_DEFAULT_TOTAL_COPIES = DEFAULT_EVENTS_PER_RUN / 10;
/** With no species present at the start, the volume stays where it always was. */
export const FALLBACK_VOLUME = 100;

/** A 1, 2 or 5 × 10ⁿ volume from the initial concentrations (species absent at the start do not count). */
export function defaultVolume(initial: Record<string, number>): number {
  const present = Object.values(initial).filter((c) => Number.isFinite(c) && c > 0);
  if (present.length === 0) return FALLBACK_VOLUME;
  const total = present.reduce((sum, c) => sum + c, 0);
  return niceFloor(Math.min(scarcestCopies / Math.min(...present), MAX_DEFAULT_TOTAL_COPIES / total));
}

/** The copies each species starts with at a volume, as the run rounds them. */
export function startingCopies(initial: Record<string, number>, volume: number): [string, number][] {
  return Object.entries(initial).map(([name, c]) => [name, Math.round(c * volume)]);
}

/** The largest 1, 2 or 5 × 10ⁿ not above the value. */
function niceFloor(value: number): number {
  const power = 10 ** Math.floor(Math.log10(value));
  const step = [5, 2, 1].find((m) => m * power <= value * (1 + 1e-12)) ?? 1;
  return Number((step * power).toPrecision(12));
}
