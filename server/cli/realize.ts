// `mechweave realize ODEFILE [--shift [x=20,y=30]] [--multiply[=x*y]] [--until T]
// [--equivalents [--complexes 2y,x+y] [--time-limit S]] [--json]`: a thin shell around realizeOde.
// `--shift` without a value (or followed by the file name) means "use the shift suggested from a
// simulated bounding box"; `--multiply` alone multiplies by the product of all variables.
// Exit 0 on success, 1 when the file has errors, 2 on bad usage.
import { readFile } from "node:fs/promises";
import type { RealizeOdeRequest, RealizeOdeResult } from "~/chem/realize/realize-ode";
import { realizeOde, RealizeRequestError } from "~/chem/realize/realize-ode";
import { realizeSettings } from "~/shared/job-schemas";
import { checkedSettings, UsageError } from "./usage";

const usage = "usage: mechweave realize ODEFILE [--shift [x=20,y=30]] [--multiply[=x*y]] [--until T] [--equivalents [--complexes 2y,x+y] [--time-limit S]] [--json]";

interface Invocation {
  file: string;
  json: boolean;
  request: Omit<RealizeOdeRequest, "ode">;
}

export function readArguments(args: string[]): Invocation {
  let file: string | null = null;
  let json = false;
  let timeLimit: number | undefined;
  const request: Invocation["request"] = {};
  const positiveNumber = (flag: string, text: string | undefined) => {
    const value = Number(text);
    if (text === undefined || !(value > 0)) throw new UsageError(`${flag} needs a positive number`);
    return value;
  };
  for (let k = 0; k < args.length; k++) {
    const arg = args[k];
    const [flag, inline] = arg.startsWith("--") && arg.includes("=") ? [arg.slice(0, arg.indexOf("=")), arg.slice(arg.indexOf("=") + 1)] : [arg, undefined];
    switch (flag) {
      case "--json":
        json = true;
        break;
      case "--multiply":
        request.multiply = inline === undefined ? true : readMonomial(inline);
        break;
      case "--equivalents":
        request.equivalents = true;
        break;
      case "--until":
        request.until = positiveNumber("--until", inline ?? args[++k]);
        break;
      case "--complexes": {
        const value = inline ?? args[++k];
        if (value === undefined) throw new UsageError("--complexes needs a list such as 2y,x+y");
        request.complexes = value.split(",").map((c) => c.trim());
        break;
      }
      case "--time-limit":
        timeLimit = positiveNumber("--time-limit", inline ?? args[++k]);
        break;
      case "--shift": {
        const value = inline ?? (args[k + 1]?.includes("=") && !args[k + 1].startsWith("--") ? args[++k] : undefined);
        request.shift = value === undefined ? "suggested" : readShift(value);
        break;
      }
      default:
        if (arg.startsWith("--")) throw new UsageError(`unknown option ${arg}`);
        if (file !== null) throw new UsageError(`one ODE file only, not also ${arg}`);
        file = arg;
    }
  }
  if (file === null) throw new UsageError("no ODE file given");
  if ((timeLimit !== undefined || request.complexes) && !request.equivalents) {
    throw new UsageError("--time-limit and --complexes go with --equivalents");
  }
  // The API's rules for the same request (a multiplier's exponents, the extra complexes).
  checkedSettings(realizeSettings, { ...request, equivalents: request.equivalents !== undefined });
  if (timeLimit !== undefined) {
    request.equivalents = { timeLimitMs: timeLimit * 1000 };
  }
  return { file, json, request };
}

/** `x*y^2` → { x: 1, y: 2 }. */
function readMonomial(text: string): Record<string, number> {
  const exponents: Record<string, number> = {};
  for (const factor of text.split("*")) {
    const match = /^\s*([A-Za-z][A-Za-z0-9_]*)\s*(?:\^\s*(\d+))?\s*$/.exec(factor);
    if (!match) throw new UsageError(`cannot read the multiplier "${text}": write --multiply=x*y^2`);
    exponents[match[1]] = (exponents[match[1]] ?? 0) + Number(match[2] ?? 1);
  }
  return exponents;
}

/** `x=20,y=30` → { x: 20, y: 30 }. */
function readShift(text: string): Record<string, number> {
  const shift: Record<string, number> = {};
  for (const part of text.split(",")) {
    const match = /^\s*([A-Za-z][A-Za-z0-9_]*)\s*=\s*(\S+)\s*$/.exec(part);
    const value = Number(match?.[2]);
    if (!match || !Number.isFinite(value)) throw new UsageError(`cannot read the shift "${part}": write --shift x=20,y=30`);
    shift[match[1]] = value;
  }
  return shift;
}

export async function run(args: string[]): Promise<number> {
  let invocation: Invocation;
  let text: string;
  try {
    invocation = readArguments(args);
    text = await readFile(invocation.file, "utf8").catch(() => {
      throw new UsageError(`cannot read ${invocation.file}`);
    });
  } catch (error) {
    process.stderr.write(`mechweave realize: ${(error as Error).message}\n${usage}\n`);
    return 2;
  }
  let result: RealizeOdeResult;
  try {
    result = await realizeOde({ ...invocation.request, ode: text });
  } catch (error) {
    process.stderr.write(`mechweave realize: ${(error as Error).message}\n`);
    return error instanceof RealizeRequestError ? 2 : 1;
  }
  process.stdout.write(invocation.json ? JSON.stringify(result, null, 2) + "\n" : readable(result, invocation.file));
  return result.diagnostics.some((d) => d.severity === "error") ? 1 : 0;
}

function readable(result: RealizeOdeResult, file: string): string {
  const lines = result.diagnostics.map((d) => `${file}:${d.line}:${d.column}: ${d.severity}: ${d.message}`);
  if (lines.length > 0 && result.diagnostics.some((d) => d.severity === "error")) return lines.join("\n") + "\n";
  if (result.original) {
    lines.push(`given ODE: ${result.original.kinetic ? "kinetic" : "not kinetic"}`);
    for (const e of result.original.negativeCrossEffects) lines.push(`  negative cross effect in ${e.equation}': ${e.term}`);
  }
  if (result.transformedOde) lines.push("transformed ODE:", ...result.transformedOde.trimEnd().split("\n").map((l) => `  ${l}`));
  lines.push(result.kinetic ? "kinetic" : "not kinetic");
  for (const e of result.negativeCrossEffects) lines.push(`  negative cross effect in ${e.equation}': ${e.term}`);
  if (result.suggestedMultiplier) {
    const shifted = result.transformations.some((t) => t.kind === "translation") ? "" : result.suggestedShift ? " (with the suggested shift)" : "";
    lines.push(`smallest multiplier: --multiply=${Object.entries(result.suggestedMultiplier).map(([v, e]) => (e === 1 ? v : `${v}^${e}`)).join("*")}${shifted}`);
  }
  if (result.suggestedShift) {
    lines.push(`suggested shift: --shift ${Object.entries(result.suggestedShift).map(([v, s]) => `${v}=${s}`).join(",")}`);
  }
  lines.push(...result.notes.map((n) => `note: ${n}`));
  if (result.mechanism) lines.push(`mechanism (${result.reactions} steps, order ${result.maxOrder}):`, result.mechanism.trimEnd());
  if (result.equivalents) {
    for (const [name, found] of Object.entries({ sparse: result.equivalents.sparse, dense: result.equivalents.dense, "weakly reversible": result.equivalents.weaklyReversible })) {
      lines.push(`${name}: ${found.status}${found.reactions !== undefined ? `, ${found.reactions} steps` : ""}`);
      if (found.mechanism) lines.push(found.mechanism.trimEnd());
    }
  }
  return lines.join("\n") + "\n";
}
