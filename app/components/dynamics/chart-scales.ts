// The numbers behind a chart's axes, shared by the live chart and its SVG export: the visible
// range, tick positions and their labels.
import { tickLabels } from "~/chem/numbers";

export interface Range {
  min: number;
  max: number;
}

/**
 * At least this share of the values' magnitude is shown, so that integration noise on a flat
 * curve (1.0000001 … 1.0000003) is drawn flat instead of stretched over the whole axis.
 */
export const minimumRelativeSpan = 0.05;

/** A linear range around the data, widened to a sensible minimum span and padded a little. */
export function linearRange(min: number, max: number): Range {
  if (!Number.isFinite(min) || !Number.isFinite(max)) return { min: 0, max: 1 };
  const magnitude = Math.max(Math.abs(min), Math.abs(max));
  if (magnitude === 0) return { min: 0, max: 1 };
  const span = Math.max(max - min, magnitude * minimumRelativeSpan);
  const middle = (min + max) / 2;
  const [low, high] = [middle - span / 2, middle + span / 2];
  const pad = (high - low) * 0.04;
  // Values that never go below zero are not given a negative margin.
  return { min: min >= 0 ? Math.max(0, low - pad) : low - pad, max: high + pad };
}

/** Decades a log axis shows at most: what lies further below the largest value is not drawn. */
export const logDecades = 12;

/**
 * A log range from the decade below the smallest positive value to the decade above the largest,
 * at most `logDecades` deep (a trace at 1e-300 would otherwise flatten everything else).
 */
export function logRange(min: number, max: number): Range {
  if (!(min > 0) || !(max > 0) || !Number.isFinite(max)) return { min: 1e-12, max: 1 };
  const top = Math.ceil(Math.log10(max));
  const bottom = Math.max(Math.floor(Math.log10(min)), top - logDecades);
  return top > bottom ? { min: Number(`1e${bottom}`), max: Number(`1e${top}`) } : { min: Number(`1e${bottom - 1}`), max: Number(`1e${top + 1}`) };
}

/** Positive values two decades apart or more: a linear axis would crowd all but the largest into its first tenth. */
export function spansDecades(min: number, max: number): boolean {
  return min > 0 && Number.isFinite(max) && max / min >= 100;
}

/** About `count` ticks at 1, 2 or 5 × 10^n steps, inside the range. */
export function linearTicks({ min, max }: Range, count = 6): number[] {
  if (!(max > min)) return [min];
  const rough = (max - min) / count;
  const power = 10 ** Math.floor(Math.log10(rough));
  const step = [1, 2, 5, 10].map((m) => m * power).find((s) => s >= rough)!;
  const ticks: number[] = [];
  for (let i = Math.ceil(min / step); i * step <= max + step * 1e-9; i++) ticks.push(Number((i * step).toPrecision(12)));
  return ticks;
}

/** Powers of ten in the range; every other one (or sparser) when there are many decades. */
export function logTicks({ min, max }: Range, count = 8): number[] {
  const first = Math.ceil(Math.log10(min) - 1e-9);
  const last = Math.floor(Math.log10(max) + 1e-9);
  const every = Math.max(1, Math.ceil((last - first + 1) / count));
  const ticks: number[] = [];
  for (let exponent = first; exponent <= last; exponent += every) ticks.push(Number(`1e${exponent}`));
  return ticks;
}

/** Labels for ticks on a log axis: only the powers of ten are written when there are two or more. */
export function logTickLabels(ticks: number[]): string[] {
  const isPower = (tick: number) => Math.abs(Math.log10(tick) - Math.round(Math.log10(tick))) < 1e-9;
  const powers = ticks.filter(isPower).length;
  const labels = tickLabels(ticks);
  return powers >= 2 ? labels.map((label, index) => (isPower(ticks[index]) ? label : "")) : labels;
}
