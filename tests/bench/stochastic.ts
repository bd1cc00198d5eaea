// Stochastic benchmark: events per second of Gillespie's direct method and Gibson–Bruck's next
// reaction method on generated mass-action networks of about 10, 500 and 2000 reactions, each run three
// times (the machine is shared: the spread says how far to trust one figure).
// Run: npx tsx tests/bench/stochastic.ts
import { simulateEnsemble, type StochasticMethod } from "~/chem/kinetics/stochastic/ensemble";
import { generatedNetwork } from "../fixtures/dynamics/models";

const TARGET_EVENTS = 400_000;
const REPEATS = 3;

for (const size of [3, 164, 664]) {
  const { mechanism, network } = generatedNetwork(size);
  const base = { volume: 200, samples: 11, seed: 1, runs: 1, maxEvents: 1e8 };
  // A short pilot run finds the end time that takes about TARGET_EVENTS events.
  const pilot = simulateEnsemble(mechanism, network, { ...base, until: 0.1, method: "next-reaction" });
  const until = (0.1 * TARGET_EVENTS) / Math.max(1, pilot.events);
  const line = [`${network.reactions.length} reactions, ${network.species.length} species:`];
  for (const method of ["direct", "next-reaction"] as StochasticMethod[]) {
    const rates: number[] = [];
    for (let repeat = 0; repeat < REPEATS; repeat++) {
      const started = performance.now();
      const tally = simulateEnsemble(mechanism, network, { ...base, until, method });
      rates.push(tally.events / ((performance.now() - started) / 1000));
    }
    rates.sort((a, b) => a - b);
    const millions = (rate: number) => (rate / 1e6).toFixed(2);
    line.push(`${method} ${millions(rates[1])} M events/s (${millions(rates[0])}–${millions(rates[2])})`);
  }
  console.log(line.join(" "));
}
