// Many independent runs of one model, summarised on a sample grid: the mean and variance of every
// species' copy number and the paths of the first few runs. Run i draws from its own stream
// (`runStream(seed, i)`), so an ensemble split into ranges of runs — over job workers — and merged
// gives the same answer as one worker running them all: copy numbers are whole, so their sums and
// sums of squares are exact in doubles (below 2^53) whatever order they are added in.

import type { Mechanism, Network } from "~/chem/model";
import { DEFAULT_EVENTS_PER_RUN, STOCHASTIC_PATHS } from "~/chem/limits";
import { directMethod } from "./direct-method";
import { nextReactionMethod } from "./next-reaction-method";
import type { PathMethod } from "./path";
import { runStream } from "./random-stream";
import { stochasticModel } from "./stochastic-model";

export type StochasticMethod = "direct" | "next-reaction";

const METHODS: Record<StochasticMethod, PathMethod> = { direct: directMethod, "next-reaction": nextReactionMethod };

/** Networks with more reactions than this run Gibson–Bruck unless asked otherwise (the direct method's linear search wins below). */
const DIRECT_UP_TO = 20;

export interface EnsembleOptions {
  volume: number;
  until: number;
  samples: number;
  seed: number;
  /** The runs to simulate: indices `first` … `first + runs − 1`. */
  first?: number;
  runs: number;
  method?: StochasticMethod;
  maxEvents?: number;
  /** Called with the share of this range's runs done, after each run. */
  onProgress?: (fraction: number) => void;
}

/** Sums over a range of runs, ready to merge with other ranges of the same ensemble. */
export interface EnsembleTally {
  t: number[];
  names: string[];
  runs: number;
  /** Per species, per sample: Σ n and Σ n² over the runs. */
  sums: number[][];
  squares: number[][];
  /** Copy numbers of runs 0 … STOCHASTIC_PATHS − 1 that fall in this range, by run index. */
  paths: { run: number; counts: number[][] }[];
  events: number;
  method: StochasticMethod;
  ms: number;
}

export interface StochasticResult {
  t: number[];
  /** Mean and sample variance (n − 1 in the denominator) of each species' copy number. */
  mean: Record<string, number[]>;
  variance: Record<string, number[]>;
  /** Copy numbers of the first runs, one record of series per run. */
  paths: Record<string, number[]>[];
  stats: { runs: number; events: number; method: StochasticMethod; volume: number; ms: number };
}

export function chooseMethod(reactions: number, method?: StochasticMethod): StochasticMethod {
  return method ?? (reactions > DIRECT_UP_TO ? "next-reaction" : "direct");
}

export function simulateEnsemble(mechanism: Mechanism, network: Network, options: EnsembleOptions): EnsembleTally {
  const started = performance.now();
  const model = stochasticModel(mechanism, network, options.volume);
  const method = chooseMethod(model.reactions.length, options.method);
  const { samples, until, runs } = options;
  const first = options.first ?? 0;
  const t = Array.from({ length: samples }, (_, i) => (i === samples - 1 ? until : (until * i) / (samples - 1)));
  const species = model.names.length;
  const sums = Array.from({ length: species }, () => new Float64Array(samples));
  const squares = Array.from({ length: species }, () => new Float64Array(samples));
  const paths: EnsembleTally["paths"] = [];
  let events = 0;
  for (let run = first; run < first + runs; run++) {
    const path = run < STOCHASTIC_PATHS ? { run, counts: model.names.map(() => new Array<number>(samples)) } : null;
    events += METHODS[method](model, {
      times: t,
      random: runStream(options.seed, run),
      maxEvents: options.maxEvents ?? DEFAULT_EVENTS_PER_RUN,
      run,
      record(sample, counts) {
        for (let s = 0; s < species; s++) {
          const n = counts[s];
          sums[s][sample] += n;
          squares[s][sample] += n * n;
          if (path) path.counts[s][sample] = n;
        }
      },
    });
    if (path) paths.push(path);
    options.onProgress?.((run - first + 1) / runs);
  }
  return {
    t,
    names: model.names,
    runs,
    sums: sums.map((row) => Array.from(row)),
    squares: squares.map((row) => Array.from(row)),
    paths,
    events,
    method,
    ms: performance.now() - started,
  };
}

/** Tallies of disjoint ranges of one ensemble, as one. */
export function mergeTallies(tallies: EnsembleTally[]): EnsembleTally {
  const [head, ...rest] = tallies;
  const add = (into: number[][], from: number[][]) => into.map((row, s) => row.map((value, i) => value + from[s][i]));
  return rest.reduce(
    (merged, tally) => ({
      ...merged,
      runs: merged.runs + tally.runs,
      sums: add(merged.sums, tally.sums),
      squares: add(merged.squares, tally.squares),
      paths: [...merged.paths, ...tally.paths].sort((x, y) => x.run - y.run),
      events: merged.events + tally.events,
      ms: Math.max(merged.ms, tally.ms),
    }),
    head,
  );
}

export function summarizeTally(tally: EnsembleTally, volume: number): StochasticResult {
  const { runs, names } = tally;
  const mean: Record<string, number[]> = {};
  const variance: Record<string, number[]> = {};
  names.forEach((name, s) => {
    mean[name] = tally.sums[s].map((sum) => sum / runs);
    variance[name] = tally.squares[s].map((square, i) => (runs > 1 ? Math.max(0, (square - (tally.sums[s][i] * tally.sums[s][i]) / runs) / (runs - 1)) : 0));
  });
  const paths = tally.paths.map(({ counts }) => Object.fromEntries(names.map((name, s) => [name, counts[s]])));
  return { t: tally.t, mean, variance, paths, stats: { runs, events: tally.events, method: tally.method, volume, ms: Math.round(tally.ms * 1000) / 1000 } };
}
