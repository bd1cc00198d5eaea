// Gillespie's direct method (J. Comput. Phys. 22 (1976) 403): the time to the next event is
// exponential with the total propensity as its rate, and the event is reaction j with probability
// aⱼ/a₀. Selection is a linear search, so each event costs O(reactions): the reference method,
// exact and simple, for small networks and for checking the faster one.

import { budgetExceeded, recordUntil, type PathMethod } from "./path";
import { fire, propensity } from "./stochastic-model";

/** Events between recomputing the total propensity from scratch, so round-off in the running sum cannot build up. */
const REFRESH_EVERY = 1024;

export const directMethod: PathMethod = (model, options) => {
  const { reactions, dependents } = model;
  const counts = model.initial.slice();
  const a = Float64Array.from(reactions, (reaction) => propensity(reaction, counts));
  let total = sum(a);
  let time = 0;
  let next = 0;
  let events = 0;
  for (;;) {
    time = total > 0 ? time - Math.log(options.random()) / total : Infinity;
    next = recordUntil(options, next, time, counts);
    if (next === options.times.length) return events;
    if (events === options.maxEvents) throw budgetExceeded(options, time);
    const j = choose(a, options.random() * total);
    // Every propensity is 0 and the running sum was round-off: nothing can happen any more.
    if (j < 0) {
      total = 0;
      continue;
    }
    fire(reactions[j], counts);
    events++;
    for (const d of dependents[j]) {
      total -= a[d];
      a[d] = propensity(reactions[d], counts);
      total += a[d];
    }
    if (events % REFRESH_EVERY === 0 || total < 0) total = sum(a);
  }
};

/** The reaction whose slice of [0, a₀) holds `target`; round-off past the end falls to the last reaction that can fire. */
function choose(a: Float64Array, target: number): number {
  let last = -1;
  for (let j = 0; j < a.length; j++) {
    if (a[j] === 0) continue;
    last = j;
    target -= a[j];
    if (target < 0) return j;
  }
  return last;
}

function sum(values: Float64Array): number {
  let total = 0;
  for (const value of values) total += value;
  return total;
}
