// `npm run -s mechweave -- COMMAND ...`: a thin dispatcher; each command lives in its own module
// exporting `run(args): Promise<number>` (the exit code). Exit 2 means bad usage.
import { z } from "zod";

// A command validates each schema once or twice and exits: zod's compiled fast path (code
// generated per schema on first use, a few ms cold) never pays back in such a process.
z.config({ jitless: true });

// Node loads the `performance` global (its perf_hooks module, 3–6 ms cold) on first use: loaded
// here at start, so that the compute time a command reports (stats.ms) is not its clock loading.
performance.now();

const commands: Record<string, () => Promise<{ run(args: string[]): Promise<number> }>> = {
  analyze: () => import("./analyze"),
  simulate: () => import("./simulate"),
  lyapunov: () => import("./lyapunov"),
  continue: () => import("./continue"),
  realize: () => import("./realize"),
  fit: () => import("./fit"),
  sensitivity: () => import("./sensitivity"),
};

const usage = `usage: mechweave <command> FILE [options]
commands:
  analyze FILE [--json]                                   network structure
  simulate FILE --until T --samples N [--rtol R --atol A] [--method M] [--json]
  simulate FILE --stochastic --volume V --runs R --seed S --until T [--samples N] [--json]
  lyapunov FILE --until T [--json]                        largest Lyapunov exponent
  continue FILE --vary NAME --from A --to B [--points N] [--json]
                                                          equilibria followed in NAME: folds, Hopf points
  fit FILE --data DATA.csv [--data MORE.csv …] --vary k1,k2 [--json]   estimate parameters
  sensitivity FILE --until T --samples N [--vary k1,k2] [--json]      ∂ln x/∂ln p over time
    (these six take --set NAME=VALUE or --set "[X]0=VALUE", repeatable, for a .weave FILE)
  realize ODEFILE [--shift x=20,y=30] [--multiply] [--json]`;

async function main(): Promise<number> {
  const [name, ...rest] = process.argv.slice(2);
  const load = name ? commands[name] : undefined;
  if (!load) {
    process.stderr.write(usage + "\n");
    return 2;
  }
  try {
    return await (await load()).run(rest);
  } catch (error) {
    process.stderr.write(`mechweave ${name}: ${error instanceof Error ? error.message : String(error)}\n`);
    return 2;
  }
}

/** Resolves once everything written to the stream so far has been handed to the OS. */
function flushed(stream: NodeJS.WriteStream): Promise<void> {
  return new Promise((resolve) => stream.write("", () => resolve()));
}

// Writes to a pipe are asynchronous: exiting at once would cut the output at the pipe's buffer
// (64 KiB), so the exit waits until both streams have drained.
main().then(async (code) => {
  await Promise.all([flushed(process.stdout), flushed(process.stderr)]);
  process.exit(code);
});
