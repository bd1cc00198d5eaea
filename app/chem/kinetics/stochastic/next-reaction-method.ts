// Gibson & Bruck's next reaction method (J. Phys. Chem. A 104 (2000) 1876): every reaction keeps
// the absolute time it fires next, in an indexed heap; after an event only the reactions in the
// dependency graph get new propensities, and their times are rescaled rather than redrawn
// (τ' = t + (a/a')(τ − t)), so an event costs O(log M) plus its dependents. Exact, like the
// direct method, and much faster on large networks where each reaction touches few others.

import { IndexedHeap } from "./indexed-heap";
import { budgetExceeded, recordUntil, type PathMethod } from "./path";
import { fire, propensity } from "./stochastic-model";

export const nextReactionMethod: PathMethod = (model, options) => {
  const { reactions, dependents } = model;
  const { random } = options;
  const counts = model.initial.slice();
  const a = Float64Array.from(reactions, (reaction) => propensity(reaction, counts));
  const firesAt = Float64Array.from(a, (rate) => (rate > 0 ? -Math.log(random()) / rate : Infinity));
  const heap = new IndexedHeap(firesAt);
  let next = 0;
  let events = 0;
  for (;;) {
    const j = reactions.length > 0 ? heap.top() : -1;
    const time = j < 0 ? Infinity : firesAt[j];
    next = recordUntil(options, next, time, counts);
    if (next === options.times.length) return events;
    if (events === options.maxEvents) throw budgetExceeded(options, time);
    fire(reactions[j], counts);
    events++;
    for (const d of dependents[j]) {
      const before = a[d];
      const now = (a[d] = propensity(reactions[d], counts));
      if (now === 0) firesAt[d] = Infinity;
      // The reaction that fired, or one that could not fire before: a fresh exponential (memoryless).
      else if (d === j || before === 0) firesAt[d] = time - Math.log(random()) / now;
      else firesAt[d] = time + (before / now) * (firesAt[d] - time);
      heap.update(d);
    }
  }
};
