// What both exact methods share: the sample grid a run is recorded on, and the event budget.

import { SimulationInputError } from "../errors";
import type { StochasticModel } from "./stochastic-model";

export interface PathOptions {
  /** Sample times, increasing, the last one the end of the run. */
  times: number[];
  /** Called with each sample's index and the copy numbers at that time (after every event at or before it). */
  record: (sample: number, counts: Float64Array) => void;
  random: () => number;
  maxEvents: number;
  /** Names the run in the budget's message. */
  run: number;
}

/** An exact method: simulates one path from the model's initial copy numbers and returns its event count. */
export type PathMethod = (model: StochasticModel, options: PathOptions) => number;

/** The run has used its events before the end time: a model this busy needs a smaller volume or time span. */
export function budgetExceeded(options: PathOptions, time: number): SimulationInputError {
  const until = options.times[options.times.length - 1];
  return new SimulationInputError(
    `run ${options.run} took ${options.maxEvents.toLocaleString("en")} reaction events and reached only t = ${time.toPrecision(3)} of ${until}; ` +
      "lower the volume or the end time, or allow more events per run",
  );
}

/** Records every sample strictly before `time` with the current copy numbers; returns the next sample's index. */
export function recordUntil(options: PathOptions, next: number, time: number, counts: Float64Array): number {
  while (next < options.times.length && options.times[next] < time) options.record(next++, counts);
  return next;
}
