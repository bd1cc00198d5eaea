// The knobs of a stochastic ensemble, one zod schema for the library, the CLI, the worker and the
// HTTP API (re-exported by app/shared/job-schemas.ts), so every door refuses the same things in
// the same words.

import { z } from "zod";
import { MAX_EVENTS_PER_RUN, MAX_SAMPLES, MAX_STOCHASTIC_RUNS } from "../../limits";
import { samplesField, untilField } from "../settings";

const runsMessage = `the number of runs must be a whole number from 1 to ${MAX_STOCHASTIC_RUNS.toLocaleString("en")}`;
const seedMessage = "the seed must be a whole number from 0 to 4294967295";
const eventsMessage = `the events per run must be a whole number from 1 to ${MAX_EVENTS_PER_RUN.toExponential(0)}`;

export const stochasticSettings = z.object({
  until: untilField,
  samples: samplesField(MAX_SAMPLES),
  /** The system size Ω: copies per unit of concentration. */
  volume: z.number({ message: "the volume must be a positive number" }).positive("the volume must be a positive number").finite("the volume must be a finite number"),
  runs: z.number({ message: runsMessage }).int(runsMessage).min(1, runsMessage).max(MAX_STOCHASTIC_RUNS, runsMessage),
  seed: z.number({ message: seedMessage }).int(seedMessage).min(0, seedMessage).max(2 ** 32 - 1, seedMessage),
  method: z.enum(["direct", "next-reaction"], { message: "the method must be direct or next-reaction" }).optional(),
  maxEvents: z.number({ message: eventsMessage }).int(eventsMessage).min(1, eventsMessage).max(MAX_EVENTS_PER_RUN, eventsMessage).optional(),
});

