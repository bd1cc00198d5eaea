// The Fit panel's pictures as ChartPictures for chart-svg.ts (the same axes, ticks, palette and
// legend as the Dynamics charts): residuals of one species over time, one marker series per data
// set, and the normalized sensitivities of one species over time, one line per parameter.
import type { ExperimentResiduals, SensitivityResult } from "~/chem/fit/types";
import { linearRange } from "~/components/dynamics/chart-scales";
import type { ChartPicture } from "~/components/dynamics/chart-svg";
import { seriesLook } from "~/components/dynamics/palette";

export const CHART_SIZE = { width: 560, height: 240 };

/** Species that have residuals in any data set, in order of first appearance. */
export function residualSpecies(residuals: readonly ExperimentResiduals[]): string[] {
  return [...new Set(residuals.flatMap((experiment) => Object.keys(experiment.species)))];
}

/** Residuals of `species`: the data sets' times merged on one axis, each data set its own markers. */
export function residualPicture(residuals: readonly ExperimentResiduals[], species: string, weighted: boolean): ChartPicture {
  const times = [...new Set(residuals.flatMap((experiment) => (experiment.species[species] ?? []).map((point) => point.t)))].sort((a, b) => a - b);
  const column = new Map(times.map((t, index) => [t, index]));
  const series = residuals.map((experiment, index) => {
    const values = new Array<number | null>(times.length).fill(null);
    for (const point of experiment.species[species] ?? []) values[column.get(point.t)!] = point.residual;
    return { name: experiment.experiment, values, markers: true, ...seriesLook(index) };
  });
  const all = series.flatMap((each) => each.values.filter((value): value is number => value !== null));
  const bound = Math.max(...all.map(Math.abs), 1e-300);
  return {
    ...CHART_SIZE,
    x: { ...linearRange(Math.min(...times, 0), Math.max(...times, 1)), log: false, label: "time", values: times },
    y: { ...linearRange(-bound, bound), log: false, label: weighted ? `residual of ${species} / sd` : `residual of ${species}` },
    series,
  };
}

/** ∂ln x/∂ln p of one species over time, one line per parameter. */
export function sensitivityPicture(result: SensitivityResult, species: string): ChartPicture {
  const rows = result.normalized[species] ?? {};
  const series = result.parameters.map((parameter, index) => ({ name: parameter, values: rows[parameter] ?? [], ...seriesLook(index) }));
  const all = series.flatMap((each) => each.values.filter((value): value is number => value !== null && Number.isFinite(value)));
  const bound = Math.max(...all.map(Math.abs), 1e-3);
  return {
    ...CHART_SIZE,
    x: { ...linearRange(0, result.t[result.t.length - 1] ?? 1), log: false, label: "time", values: result.t },
    y: { ...linearRange(-bound, bound), log: false, label: `∂ln [${species}] / ∂ln p` },
    series,
  };
}

/** For the heat map: the signed value of largest magnitude of each species × parameter over the run. */
export function peakSensitivities(result: SensitivityResult): Record<string, Record<string, number | null>> {
  return Object.fromEntries(
    Object.entries(result.normalized).map(([species, byParameter]) => [
      species,
      Object.fromEntries(
        result.parameters.map((parameter) => {
          let peak: number | null = null;
          for (const value of byParameter[parameter] ?? []) if (value !== null && Number.isFinite(value) && (peak === null || Math.abs(value) > Math.abs(peak))) peak = value;
          return [parameter, peak];
        }),
      ),
    ]),
  );
}
