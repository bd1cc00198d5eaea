// One zod schema per job kind — simulate, stochastic, equilibrium, Lyapunov, sweep, continuation, realize, fit, sensitivity, witness — used by the
// HTTP API (to read bodies), the command line (to check its flags) and the worker (to check what
// crossed into it), so every door refuses the same input with the same words; the job types are
// `z.infer` of these. The numbers are the library's limits (app/chem/limits.ts); the shared
// server's smaller ones (samples, sweep points) are checked by the job runner and answer 413.
import { z } from "zod";
import { boundsSchema, sensitivityRequestSchema } from "~/chem/fit/types";
import { integrationSettings, samplesField, simulationSettings, untilField } from "~/chem/kinetics/settings";
import { stochasticSettings } from "~/chem/kinetics/stochastic/settings";
import { byteSize, MAX_BIFURCATION_SWEEP_STEPS, MAX_COMPLEX_CHARS, MAX_CONTINUATION_POINTS, MAX_CSV_BYTES, MAX_EXTRA_COMPLEXES, MAX_FIT_DATA_SETS, MAX_FIT_PARAMETERS, MAX_NAME_CHARS, MAX_MULTIPLIER_EXPONENT, MAX_OVERRIDE_NAME_CHARS, MAX_OVERRIDES, MAX_SERVER_SAMPLES, MAX_SWEEP_POINTS, MAX_SWEEP_SAMPLES, MAX_WITNESS_JOB_MS } from "~/chem/limits";
import { cleanText, odeField, sourceField } from "./fields";

// ── The job kinds ──────────────────────────────────────────────────────────────────────────────
/** A time course: `{ until, samples, rtol?, atol?, method? }`. */
export const simulateSettings = simulationSettings;

/** Many runs of the jump process: `{ until, samples, volume, runs, seed, method?, maxEvents? }`. */
export { stochasticSettings };

/** Steady states by Newton's method in the class, from `start`, a run to `settleTime`, the initial state and random points. */
export const equilibriumSettings = z.object({
  settleTime: z.number().positive("the settling time must be a positive number").optional(),
  start: z.array(z.number()).optional(),
});

/** The largest Lyapunov exponent over `[transient, until]`, renormalising every `interval`. */
export const lyapunovSettings = integrationSettings.extend({
  until: untilField,
  transient: z.number().nonnegative("the transient must be a non-negative time").optional(),
  interval: z.number().positive("the renormalisation interval must be a positive time").optional(),
});

/** What a sweep or a continuation varies by name; a sweep may also name a reaction by its index. */
const namedTargets = [
  z.object({ kind: z.literal("parameter"), name: cleanText("The parameter") }),
  /** An initial concentration: through the conservation laws it sets the totals, the compatibility class. */
  z.object({ kind: z.literal("initial"), species: cleanText("The species") }),
  /** A step's mass-action coefficient by its label; `backward` for a reversible step's other one. */
  z.object({ kind: z.literal("step"), label: cleanText("The step label"), direction: z.enum(["forward", "backward"]).optional() }),
  /** A species held constant (`fixed [B] = …`). */
  z.object({ kind: z.literal("fixed"), species: cleanText("The species") }),
] as const;

/** What a sweep varies. A new kind of target is one more member here and a case in `sweepNetwork`. */
export const sweepTarget = z.discriminatedUnion("kind", [...namedTargets, z.object({ kind: z.literal("rate"), reaction: z.number().int().nonnegative() })]);
export type SweepTarget = z.infer<typeof sweepTarget>;
export const continuationTarget = z.discriminatedUnion("kind", [...namedTargets]);
export type ContinuationTarget = z.infer<typeof continuationTarget>;

/** One observable of one species per value of the target, over a linear or logarithmic range. */
export const sweepSettings = integrationSettings.extend({
  until: untilField,
  samples: samplesField(MAX_SWEEP_SAMPLES),
  target: sweepTarget,
  from: z.number().nonnegative("the sweep range must be non-negative numbers"),
  to: z.number().nonnegative("the sweep range must be non-negative numbers"),
  points: z.number().int().min(2, `a sweep takes from 2 to ${MAX_SWEEP_POINTS} points`).max(MAX_SWEEP_POINTS, `a sweep takes from 2 to ${MAX_SWEEP_POINTS} points`),
  scale: z.enum(["linear", "log"]),
  species: cleanText("The species"),
  observable: z.enum(["final", "max", "period"]),
});

/** One branch of equilibria followed from `from` to `to` in the target, with at most `maxPoints` points. */
const continuationRange = "the continuation range must be two different non-negative numbers";
const secondSteps = `the second parameter takes from 2 to ${MAX_BIFURCATION_SWEEP_STEPS} values`;
export const continuationSettings = z
  .object({
    target: continuationTarget,
    from: z.number().nonnegative(continuationRange),
    to: z.number().nonnegative(continuationRange),
    maxPoints: z
      .number()
      .int()
      .min(2, `a continuation takes from 2 to ${MAX_CONTINUATION_POINTS} points`)
      .max(MAX_CONTINUATION_POINTS, `a continuation takes from 2 to ${MAX_CONTINUATION_POINTS} points`)
      .optional(),
    /** A second parameter swept in `steps` values, one continuation at each: the fold and Hopf curves in both. */
    second: z
      .object({
        target: continuationTarget,
        from: z.number().nonnegative(continuationRange),
        to: z.number().nonnegative(continuationRange),
        steps: z.number().int().min(2, secondSteps).max(MAX_BIFURCATION_SWEEP_STEPS, secondSteps),
      })
      .optional(),
  })
  .refine((settings) => settings.from !== settings.to, { message: continuationRange, path: ["to"] });

/** How to realize a polynomial ODE: transformations first, then the searches for equivalents. */
const exponentMessage = `a multiplier's exponents are whole numbers from 0 to ${MAX_MULTIPLIER_EXPONENT}`;
export const realizeSettings = z.object({
  shift: z.union([z.record(z.string(), z.number()), z.literal("suggested")], { message: 'the shift is { variable: number, … } or "suggested"' }).optional(),
  multiply: z.union([z.boolean(), z.record(z.string(), z.number().int(exponentMessage).min(0, exponentMessage).max(MAX_MULTIPLIER_EXPONENT, exponentMessage))]).optional(),
  until: untilField.optional(),
  equivalents: z.boolean().optional(),
  complexes: z
    .array(cleanText("A complex").max(MAX_COMPLEX_CHARS, `Keep each complex under ${MAX_COMPLEX_CHARS} characters.`))
    .max(MAX_EXTRA_COMPLEXES, `Offer at most ${MAX_EXTRA_COMPLEXES} extra complexes.`)
    .optional(),
});

/** What a fit or a sensitivity run varies: parameter names, or initial values as `[X]0`. */
const varyField = z
  .array(cleanText("A parameter name").min(1, "A parameter name is empty.").max(MAX_OVERRIDE_NAME_CHARS, `Keep each parameter name under ${MAX_OVERRIDE_NAME_CHARS} characters.`))
  .max(MAX_FIT_PARAMETERS, `Vary at most ${MAX_FIT_PARAMETERS} parameters at once.`);

/** A measured time course as CSV text: a `time` column and one column per species. */
export const dataSetField = z.object({
  name: cleanText("The data set's name").trim().min(1, "Name the data set.").max(MAX_NAME_CHARS, `Keep the data set's name under ${MAX_NAME_CHARS} characters.`),
  csv: cleanText("The CSV").refine((csv) => new TextEncoder().encode(csv).length <= MAX_CSV_BYTES, `A data set is at most ${byteSize(MAX_CSV_BYTES)} of CSV.`),
});
export type DataSetText = z.infer<typeof dataSetField>;

/** A weighted least-squares fit of the varied parameters to one or more data sets, each an experiment (CSV read in the worker). */
export const fitSettings = z.object({
  vary: varyField.min(1, "Name at least one parameter to vary."),
  /** Optional bounds per varied parameter (positive: the search runs in log space). */
  bounds: z.record(z.string(), boundsSchema).optional(),
  data: z.array(dataSetField).min(1, "Give at least one data set.").max(MAX_FIT_DATA_SETS, `A fit reads at most ${MAX_FIT_DATA_SETS} data sets.`),
});

/** Normalized sensitivities ∂ln x/∂ln p over [0, until] (default: every named rate coefficient), with the shared server's sample limit. */
export const sensitivitySettings = sensitivityRequestSchema.extend({
  samples: samplesField(MAX_SERVER_SAMPLES),
  vary: varyField.min(1, "Name at least one parameter, or leave vary out for every named rate coefficient.").optional(),
});

/** A multistationarity witness search given `budgetMs` milliseconds (a second up to the limit). */
const witnessBudget = `the witness search's budget is from 1000 to ${MAX_WITNESS_JOB_MS} milliseconds`;
export const witnessSettings = z.object({ budgetMs: z.number().int(witnessBudget).min(1000, witnessBudget).max(MAX_WITNESS_JOB_MS, witnessBudget) });

export type WitnessSettings = z.infer<typeof witnessSettings>;
export type FitSettings = z.infer<typeof fitSettings>;
export type SensitivitySettings = z.infer<typeof sensitivitySettings>;
export type SimulateSettings = z.infer<typeof simulateSettings>;
export type StochasticSettings = z.infer<typeof stochasticSettings>;
export type EquilibriumSettings = z.infer<typeof equilibriumSettings>;
export type LyapunovSettings = z.infer<typeof lyapunovSettings>;
export type SweepSettings = z.infer<typeof sweepSettings>;
export type ContinuationSettings = z.infer<typeof continuationSettings>;
export type RealizeSettings = z.infer<typeof realizeSettings>;

// ── With the text they run on, as the API takes them ───────────────────────────────────────────
const overrideValues = z
  .record(
    cleanText("The name").max(MAX_OVERRIDE_NAME_CHARS, `Keep each overridden name under ${MAX_OVERRIDE_NAME_CHARS} characters.`),
    z.number().nonnegative("an overridden value must be a number ≥ 0").finite("an overridden value must be a finite number"),
  )
  .refine((values) => Object.keys(values).length <= MAX_OVERRIDES, `At most ${MAX_OVERRIDES} overrides.`);

/** Values that replace the text's parameters and initial concentrations for this run (the CLI's `--set`). */
export const overrides = z.object({ parameters: overrideValues.default({}), initial: overrideValues.default({}) });
export type Overrides = z.infer<typeof overrides>;

/** A realization request: the ODE text and how to realize it. */
export const realizeRequest = realizeSettings.extend({ ode: odeField });
export type RealizeRequest = z.infer<typeof realizeRequest>;

/** Any dynamics job on a mechanism text, as the Dynamics panel sends it. */
export const mechanismJobRequest = z.discriminatedUnion("kind", [
  z.object({ kind: z.literal("simulate"), source: sourceField, overrides: overrides.optional(), settings: simulateSettings }),
  z.object({ kind: z.literal("stochastic"), source: sourceField, overrides: overrides.optional(), settings: stochasticSettings }),
  z.object({ kind: z.literal("equilibrium"), source: sourceField, overrides: overrides.optional(), options: equilibriumSettings }),
  z.object({ kind: z.literal("lyapunov"), source: sourceField, overrides: overrides.optional(), options: lyapunovSettings }),
  z.object({ kind: z.literal("sweep"), source: sourceField, overrides: overrides.optional(), options: sweepSettings }),
  z.object({ kind: z.literal("continuation"), source: sourceField, overrides: overrides.optional(), options: continuationSettings }),
  z.object({ kind: z.literal("witness"), source: sourceField, overrides: overrides.optional(), options: witnessSettings }),
]);

/** A time course of a text that is not a saved mechanism: a polynomial ODE or a mechanism. */
export const textSimulationRequest = z
  .object({ ode: odeField.optional(), source: sourceField.optional(), settings: simulateSettings })
  .refine((b) => (b.ode === undefined) !== (b.source === undefined), "Send either ode or source.");
