// Every number that is a rule a person can run into: how much text, how many samples, how long a
// name. One home, so the editor, the API, the worker, the CLI and the messages never disagree. It
// sits in the chemistry library because every side may import app/chem and app/chem imports
// nothing of the app (decision 013-one-home-for-limits-and-errors).

const KiB = 1024;
const MiB = 1024 * KiB;

// ── Texts ──────────────────────────────────────────────────────────────────────────────────────
/** The largest mechanism text anywhere: editor, live document, API and database. */
export const MAX_SOURCE_BYTES = 1 * MiB;
/** Steps a mechanism may have before the analysis refuses it unread. */
export const MAX_SOURCE_STEPS = 20_000;
/** A polynomial ODE text (realization, the side-by-side check): its expansion is the cost, not its length. */
export const MAX_ODE_BYTES = 64 * KiB;

// ── Time courses ───────────────────────────────────────────────────────────────────────────────
/** Samples of one time course in the library and the command line, where only the caller waits. */
export const MAX_SAMPLES = 100_000;
/**
 * Samples of one run on the shared server: every sample of every series crosses from the worker
 * and travels as JSON, and the Dynamics panel draws them. Larger runs answer 413.
 */
export const MAX_SERVER_SAMPLES = 20_000;
/** Samples of each point of a sweep: one observable is kept per point, so few suffice. */
export const MAX_SWEEP_SAMPLES = 5_000;
/** Points of one sweep in the library and the command line. */
export const MAX_SWEEP_POINTS = 500;
/** Points of one sweep on the shared server (each point is a whole run). Larger sweeps answer 413. */
export const MAX_SERVER_SWEEP_POINTS = 200;
/** Points on one continued branch of equilibria (each costs a few Newton steps, not a simulation). */
export const MAX_CONTINUATION_POINTS = 2_000;
/** Values of a second parameter, each one whole continuation in the first. */
export const MAX_BIFURCATION_SWEEP_STEPS = 50;

// ── Stochastic runs ────────────────────────────────────────────────────────────────────────────
/** Runs of one stochastic ensemble: each is a whole simulation, and the mean needs only hundreds. */
export const MAX_STOCHASTIC_RUNS = 10_000;
/** Reaction events one stochastic run may take unless told otherwise, and at most when told. */
export const DEFAULT_EVENTS_PER_RUN = 1_000_000;
export const MAX_EVENTS_PER_RUN = 1_000_000_000;
/**
 * Copy numbers a stochastic run may start from. An exact method fires every event, so a system
 * this large is the deterministic run's business (and the event budget would stop it anyway).
 */
export const MAX_COPY_NUMBER = 1e9;
/** Runs whose sample paths a stochastic result carries (runs 0, 1, …, by index). */
export const STOCHASTIC_PATHS = 3;

// ── Overrides of one run ───────────────────────────────────────────────────────────────────────
/** Parameters and initial concentrations one dynamics request may replace, and the characters of each name. */
export const MAX_OVERRIDES = 100;
export const MAX_OVERRIDE_NAME_CHARS = 200;

// ── Files ──────────────────────────────────────────────────────────────────────────────────────
/** A measured time course read from CSV. */
export const MAX_CSV_BYTES = 5 * MiB;
export const MAX_CSV_ROWS = 100_000;
/** Data sets stored with one mechanism, and data sets one fit reads at once. */
export const MAX_DATA_SETS_PER_MECHANISM = 50;
export const MAX_FIT_DATA_SETS = 10;
/** Parameters one fit or sensitivity run varies. */
export const MAX_FIT_PARAMETERS = 20;
/** Entries of the stoichiometric matrix exported as CSV: beyond this (tens of MB) a spreadsheet is the wrong tool. */
export const MAX_CSV_EXPORT_ENTRIES = 2_000_000;
/** An SBML file to import. */
export const MAX_SBML_BYTES = 4 * MiB;
/** What a multipart upload adds around the file (boundaries, part headers) before its size is known. */
export const MULTIPART_OVERHEAD_BYTES = 64 * KiB;
/** A JSON request body: a mechanism text at its limit, escaped, fits. */
export const MAX_JSON_BODY_BYTES = 2 * MiB;

// ── Names and short texts ──────────────────────────────────────────────────────────────────────
export const MAX_TITLE_CHARS = 200;
export const MAX_SUMMARY_CHARS = 2000;
/** An access token's name, a view link's label. */
export const MAX_LABEL_CHARS = 80;
/** A person's name, a named version. */
export const MAX_NAME_CHARS = 120;

// ── Realization requests ───────────────────────────────────────────────────────────────────────
/** Extra complexes offered to the search for equivalent mechanisms, and the characters of each. */
export const MAX_EXTRA_COMPLEXES = 200;
export const MAX_COMPLEX_CHARS = 200;
/** The largest exponent of a variable in a monomial multiplier. */
export const MAX_MULTIPLIER_EXPONENT = 20;

/** "1 MiB", "64 KiB": a byte limit as the messages say it. */
export function byteSize(bytes: number): string {
  return bytes >= MiB ? `${bytes / MiB} MiB` : `${bytes / KiB} KiB`;
}

const arrow = /->|→|<=>|<->|⇌|⇄/;

/** A message refusing the text, or null when it is within the limits. Checked before parsing, so one oversized paste cannot stall a shared room. */
export function checkSourceLimits(source: string): string | null {
  const bytes = source.length > MAX_SOURCE_BYTES ? source.length : new TextEncoder().encode(source).length;
  if (bytes > MAX_SOURCE_BYTES) {
    return `This mechanism is ${(bytes / MAX_SOURCE_BYTES).toFixed(1)} MiB of text; Mechweave reads at most ${byteSize(MAX_SOURCE_BYTES)}.`;
  }
  let steps = 0;
  for (const line of source.split("\n")) {
    const hash = line.indexOf("#");
    if (arrow.test(hash < 0 ? line : line.slice(0, hash))) steps++;
  }
  if (steps > MAX_SOURCE_STEPS) {
    return `This mechanism has ${steps.toLocaleString("en")} steps; Mechweave analyses at most ${MAX_SOURCE_STEPS.toLocaleString("en")}.`;
  }
  return null;
}

// ── Structural verdicts recomputed on every change ────────────────────────────────────────────
/**
 * Work of the minimal-siphon search, in reactant and reaction visits (a few tenths of a second). Minimal siphons can be
 * exponentially many; real mechanisms have few, and a few hundred species need a few hundred branches.
 */
export const MAX_SIPHON_SEARCH_WORK = 300_000;
/**
 * Terms of the injectivity determinant examined: (reaction set, species set) pairs of the rank's
 * size, C(reactions, rank) × C(species, rank). Beyond it the verdict is "undecided: too large".
 */
export const MAX_DETERMINANT_TERMS = 2_000_000;
/** Sample points the multistationarity witness search tries before it gives up. */
export const MAX_WITNESS_SAMPLES = 400;
/** Milliseconds the command line's `analyze` spends searching for a multistationarity witness (rooms search none). */
export const MAX_WITNESS_SEARCH_MS = 3000;
/** Milliseconds a queued witness search may take when the panel's "run it" asks for one, and the most it may ask. */
export const DEFAULT_WITNESS_JOB_MS = 20_000;
export const MAX_WITNESS_JOB_MS = 50_000;
/** Sample points a queued witness search tries: ten times the command line's, for the longer budget. */
export const MAX_WITNESS_JOB_SAMPLES = 4000;
