// One-parameter sweeps: vary a reaction's rate coefficient, a step's coefficient (by label), a
// parameter (a temperature T in expression coefficients included), a held species' concentration
// or a species' initial concentration over a linear or logarithmic range and record one observable
// of one species per value — its final value, its maximum, or its period when the course settles
// into sustained oscillation. For a reaction or an initial value the system is compiled once and
// each point only changes a number; the others may enter several coefficients and laws (and a
// coefficient of 0 takes its reaction out of the network), so each point rebuilds the network.

import type { Mechanism, Network, Step } from "~/chem/model";
// What a sweep varies has one definition: the zod schema every door checks it with.
import type { ContinuationTarget, SweepTarget } from "~/shared/job-schemas";
import { MAX_SWEEP_POINTS } from "~/chem/limits";
import { buildNetwork } from "~/chem/network";
import { SimulationCancelled, SimulationInputError } from "./errors";
import { networkSystem } from "./from-network";
import type { OdeSystem } from "./ode-system";
import { oscillationPeriod } from "./oscillation";
import type { SimulationSettings } from "./settings";
import { simulateSystem } from "./simulate";

export type Observable = "final" | "max" | "period";

export interface SweepOptions extends SimulationSettings {
  target: SweepTarget;
  from: number;
  to: number;
  points: number;
  scale: "linear" | "log";
  species: string;
  observable: Observable;
  signal?: AbortSignal;
  onProgress?: (fraction: number) => void;
}

export interface SweepResult {
  values: number[];
  /** The observable per value; null for a period where the course does not oscillate. */
  observed: (number | null)[];
  stats: { steps: number; rejected: number; jacobians: number; ms: number };
}

export function sweepValues(from: number, to: number, points: number, scale: "linear" | "log"): number[] {
  if (!(Number.isInteger(points) && points >= 2 && points <= MAX_SWEEP_POINTS)) {
    throw new SimulationInputError(`a sweep takes from 2 to ${MAX_SWEEP_POINTS} points`);
  }
  if (!(Number.isFinite(from) && Number.isFinite(to) && from >= 0 && to >= 0)) throw new SimulationInputError("the sweep range must be non-negative numbers");
  if (scale === "log" && !(from > 0 && to > 0)) throw new SimulationInputError("a logarithmic sweep needs a positive range");
  return Array.from({ length: points }, (_, i) => {
    const s = i / (points - 1);
    return scale === "log" ? from * Math.pow(to / from, s) : from + s * (to - from);
  });
}

export function sweepNetwork(mechanism: Mechanism, network: Network, options: SweepOptions): SweepResult {
  const started = performance.now();
  const values = sweepValues(options.from, options.to, options.points, options.scale);
  if (!network.species.includes(options.species)) throw new SimulationInputError(`there is no species ${options.species} to observe`);
  const systemAt = pointSystems(options.target, mechanism, network);

  const stats = { steps: 0, rejected: 0, jacobians: 0, ms: 0 };
  const observed = values.map((value, i) => {
    if (options.signal?.aborted) throw new SimulationCancelled();
    const run = simulateSystem(systemAt(value), { ...options, onProgress: undefined });
    stats.steps += run.stats.steps;
    stats.rejected += run.stats.rejected;
    stats.jacobians += run.stats.jacobians;
    options.onProgress?.((i + 1) / values.length);
    const course = run.series[options.species];
    if (options.observable === "final") return course[course.length - 1];
    if (options.observable === "max") return Math.max(...course);
    return oscillationPeriod(run.t, course);
  });
  stats.ms = Math.round((performance.now() - started) * 1000) / 1000;
  return { values, observed, stats };
}

/** The system to simulate at each value of the target. */
function pointSystems(target: SweepTarget, mechanism: Mechanism, network: Network): (value: number) => OdeSystem {
  if (target.kind === "initial") {
    const system = networkSystem(mechanism, network);
    const index = system.names.indexOf(target.species);
    if (index < 0) throw new SimulationInputError(`there is no species ${target.species} to vary`);
    return (value) => {
      system.initial[index] = value;
      return system;
    };
  }
  if (target.kind === "rate") {
    const reaction = network.reactions[target.reaction];
    if (!reaction) throw new SimulationInputError(`there is no reaction ${target.reaction} to vary`);
    if (reaction.law !== null) throw new SimulationInputError("a step with a custom rate law has no rate coefficient to vary");
    const system = networkSystem(mechanism, network);
    // Monomials are numbered over the mass-action reactions in network order (see from-network.ts).
    const monomial = network.reactions.slice(0, target.reaction).filter((r) => r.law === null).length;
    return (value) => {
      system.coefficients[monomial] = value;
      return system;
    };
  }
  // The network is built anew: the value folds into every coefficient that uses it, and a
  // reaction left out while its coefficient was 0 comes back (and the reverse).
  const varied = variedMechanism(target, mechanism);
  return (value) => {
    const point = varied(value);
    return networkSystem(point, buildNetwork(point));
  };
}

/** The mechanism at each value of a target that names something in it (not a reaction by index). */
export function variedMechanism(target: ContinuationTarget, mechanism: Mechanism): (value: number) => Mechanism {
  switch (target.kind) {
    case "initial":
      if (!(target.species in mechanism.initial) && !mechanism.species.includes(target.species)) throw new SimulationInputError(`there is no species ${target.species} to vary`);
      return (value) => ({ ...mechanism, initial: { ...mechanism.initial, [target.species]: value } });
    case "parameter":
      if (!(target.name in mechanism.parameters)) throw new SimulationInputError(`there is no parameter ${target.name} to vary`);
      return (value) => ({ ...mechanism, parameters: { ...mechanism.parameters, [target.name]: value } });
    case "fixed":
      if (!(target.species in mechanism.fixed)) throw new SimulationInputError(`there is no held (fixed) species ${target.species} to vary`);
      return (value) => ({ ...mechanism, fixed: { ...mechanism.fixed, [target.species]: value } });
    case "step": {
      const index = mechanism.steps.findIndex((step) => step.label === target.label);
      if (index < 0) throw new SimulationInputError(`there is no step labelled ${target.label} to vary`);
      const step = mechanism.steps[index];
      if (step.law !== null) throw new SimulationInputError("a step with a custom rate law has no rate coefficient to vary");
      const direction = target.direction ?? "forward";
      if (direction === "backward" && !step.reversible) throw new SimulationInputError(`step ${target.label} is irreversible: it has no backward coefficient`);
      return (value) => {
        const changed: Step = { ...step, [direction]: { kind: "value", value } };
        return { ...mechanism, steps: mechanism.steps.map((each, i) => (i === index ? changed : each)) };
      };
    }
  }
}
