// `mechweave simulate FILE --until T --samples N [--rtol R --atol A] [--method auto|stiff|explicit|bdf|rodas4]
// [--set NAME=VALUE …] [--json]`; with `--stochastic`, an ensemble of exact stochastic runs instead
// (`stochastic.ts`). FILE is a mechanism (.weave) or a polynomial ODE (.ode). Exit 0
// on success, 1 when the file has errors or cannot be simulated, 2 on bad usage. The model loading
// here is shared with the `lyapunov` command.

import { extname } from "node:path";
import { IntegrationFailure, SimulationInputError } from "~/chem/kinetics/errors";
import { METHOD_NAMES } from "~/chem/kinetics/settings";
import type { SimulationResult } from "~/chem/kinetics/simulate";
import { compileEngineAhead } from "~/chem/kinetics/wasm/wasm-engine";
import type { Diagnostic } from "~/chem/model";
import { buildNetwork } from "~/chem/network";
import { parseOde } from "~/chem/ode/parse";
import type { Settings } from "~/chem/parse";
import { simulateSettings } from "~/shared/job-schemas";
import { runJob, type DynamicsModel } from "../sim/job";
import { parseWithSettings, readCommandLine, readSource, SETTINGS_FLAG, type FlagKind, type FlagValue } from "./command-line";
import { checkedSettings, UsageError } from "./usage";

/** Reads and parses a model file; diagnostics carry the file's errors (then `model` is null). */
export async function loadModel(file: string, settings?: Settings): Promise<{ model: DynamicsModel | null; diagnostics: Diagnostic[] }> {
  const extension = extname(file);
  if (extension !== ".weave" && extension !== ".ode") throw new UsageError(`FILE must be a .weave mechanism or a .ode system, not "${file}"`);
  const text = await readSource(file);
  if (extension === ".ode") {
    if (settings) throw new UsageError("--set applies to .weave mechanisms; edit the .ode file's parameter lines instead");
    const { ode, diagnostics } = parseOde(text);
    const failed = ode === null || diagnostics.some((d) => d.severity === "error");
    return { model: failed ? null : { kind: "ode", ode }, diagnostics };
  }
  const { mechanism, diagnostics } = parseWithSettings(text, file, settings);
  if (diagnostics.some((d) => d.severity === "error")) return { model: null, diagnostics };
  return { model: { kind: "mechanism", mechanism, network: buildNetwork(mechanism) }, diagnostics };
}

/**
 * The frame every dynamics command shares: usage errors exit 2, a file with errors or a model that
 * cannot be integrated exits 1 — each with a one-line message, never a stack trace.
 */
export async function runModelCommand(
  command: string,
  args: string[],
  declared: Record<string, FlagKind>,
  body: (model: DynamicsModel, flags: Record<string, FlagValue>) => unknown | Promise<unknown>,
  printText: (result: never) => string,
): Promise<number> {
  const fail = (message: string, code: number, json: boolean, diagnostics: Diagnostic[] = []) => {
    process.stderr.write(`mechweave ${command}: ${message}\n`);
    if (json) process.stdout.write(JSON.stringify({ error: message, diagnostics }) + "\n");
    return code;
  };
  let parsed: ReturnType<typeof readCommandLine>;
  let loaded: Awaited<ReturnType<typeof loadModel>>;
  try {
    parsed = readCommandLine(args, { ...declared, ...SETTINGS_FLAG, json: "switch" });
    loaded = await loadModel(parsed.file, parsed.flags.set as Settings | undefined);
  } catch (error) {
    if (error instanceof UsageError) return fail(error.message, 2, args.includes("--json"));
    throw error;
  }
  const json = parsed.flags.json === true;
  for (const d of loaded.diagnostics) process.stderr.write(`${parsed.file}:${d.line}:${d.column}: ${d.severity}: ${d.message}\n`);
  if (!loaded.model) return fail(`${parsed.file} has errors`, 1, json, loaded.diagnostics);
  try {
    const result = await body(loaded.model, parsed.flags);
    process.stdout.write((json ? JSON.stringify(result) : printText(result as never)) + "\n");
    return 0;
  } catch (error) {
    if (error instanceof UsageError) return fail(error.message, 2, json);
    if (error instanceof SimulationInputError || error instanceof IntegrationFailure) return fail(error.message, 1, json, loaded.diagnostics);
    throw error;
  }
}

export function run(args: string[]): Promise<number> {
  if (args.includes("--stochastic")) return import("./stochastic").then(({ runStochastic }) => runStochastic(args));
  // The engine compiles in the background while the file is read and parsed.
  const engineReady = compileEngineAhead();
  return runModelCommand(
    "simulate",
    args,
    { until: "number", samples: "integer", rtol: "number", atol: "number", method: "method" },
    async (model, flags) => {
      if (flags.until === undefined) throw new UsageError("--until T is required");
      const settings = checkedSettings(simulateSettings, {
        until: flags.until,
        samples: flags.samples ?? 101,
        rtol: flags.rtol,
        atol: flags.atol,
        method: flags.method,
      });
      await engineReady;
      const result = runJob({ kind: "simulate", model, settings });
      return { t: result.t, series: result.series, stats: result.stats };
    },
    (result: Pick<SimulationResult, "t" | "series" | "stats">) => {
      const names = Object.keys(result.series);
      const rows = result.t.map((t, i) => [t, ...names.map((name) => result.series[name][i])].map((x) => x.toPrecision(6)).join("\t"));
      const { steps, rejected, jacobians, factorizations, method, engine, ms } = result.stats;
      const where = engine === "wasm" ? "WebAssembly" : "JavaScript";
      const summary = `# ${steps} steps, ${rejected} rejected, ${jacobians} Jacobians, ${factorizations} LU factorisations, ${METHOD_NAMES[method]} in ${where}, ${ms} ms`;
      return [["t", ...names].join("\t"), ...rows, summary].join("\n");
    },
  );
}
