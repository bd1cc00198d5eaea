// The geometry of an ensemble chart, apart from React so it can be tested: per species the band of
// mean ± one standard deviation (never below zero copies), the mean line and the sample paths, as
// SVG path data in a plot box whose ticks come from chart-scales.ts.
import type { StochasticResult } from "~/chem/kinetics/stochastic/ensemble";
import { linearRange, linearTicks, type Range } from "./chart-scales";

export interface PlotBox {
  left: number;
  top: number;
  width: number;
  height: number;
}

export interface EnsembleShapes {
  name: string;
  band: string;
  mean: string;
  paths: string[];
}

export interface EnsembleGeometry {
  x: Range & { ticks: number[] };
  y: Range & { ticks: number[] };
  shapes: EnsembleShapes[];
}

export function ensembleGeometry(result: StochasticResult, shown: string[], box: PlotBox): EnsembleGeometry {
  const sd = (name: string) => result.variance[name].map(Math.sqrt);
  const high = shown.flatMap((name) => [...result.mean[name].map((m, i) => m + sd(name)[i]), ...result.paths.flatMap((path) => path[name])]);
  const y = linearRange(0, high.length ? Math.max(...high) : 1);
  const x = { min: result.t[0], max: result.t[result.t.length - 1] };
  const px = (t: number) => box.left + ((t - x.min) / (x.max - x.min || 1)) * box.width;
  const py = (n: number) => box.top + box.height - ((n - y.min) / (y.max - y.min || 1)) * box.height;
  const line = (values: number[]) => values.map((value, i) => `${i ? "L" : "M"}${px(result.t[i]).toFixed(1)},${py(value).toFixed(1)}`).join("");
  const shapes = shown.map((name) => {
    const mean = result.mean[name];
    const spread = sd(name);
    const upper = mean.map((m, i) => m + spread[i]);
    const lower = mean.map((m, i) => Math.max(0, m - spread[i]));
    const back = lower.map((n, i) => `L${px(result.t[i]).toFixed(1)},${py(n).toFixed(1)}`).reverse().join("");
    return { name, band: `${line(upper)}${back}Z`, mean: line(mean), paths: result.paths.map((path) => line(path[name])) };
  });
  return { x: { ...x, ticks: linearTicks(x) }, y: { ...y, ticks: linearTicks(y) }, shapes };
}
