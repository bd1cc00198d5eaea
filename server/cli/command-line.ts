// Reading a command line and the mechanism it names, shared by every command. Kept apart from the
// commands so `analyze` loads none of the integrators, ODE parsing or exchange formats that
// `simulate` needs: import time is most of a one-step command's wall time.

import { readFile } from "node:fs/promises";
import { METHODS } from "~/chem/kinetics/settings";
import type { ParseResult } from "~/chem/model";
import { readOverride } from "~/chem/overrides";
import { parseMechanismWithSettings, type Settings } from "~/chem/parse";
import { UsageError } from "./usage";

/** "text" takes one string; "texts" may be repeated and collects every value in order. */
export type FlagKind = "number" | "integer" | "method" | "switch" | "settings" | "text" | "texts";
export type FlagValue = number | string | boolean | Settings | string[];

/** Every command that reads a mechanism takes `--set` (repeatable). */
export const SETTINGS_FLAG = { set: "settings" } as const;

/** `NAME=VALUE` sets a parameter, `[X]0=VALUE` an initial concentration; VALUE a number ≥ 0. */
function addSetting(settings: Settings, text: string): void {
  const reading = readOverride(text);
  if (!reading.ok) throw new UsageError(`--set: ${reading.message}`);
  settings[reading.into][reading.name] = reading.value;
}

/** Reads `FILE --name value … --switch`; every flag must be declared, every value well-formed. */
export function readCommandLine(args: string[], declared: Record<string, FlagKind>): { file: string; flags: Record<string, FlagValue> } {
  const flags: Record<string, FlagValue> = {};
  const files: string[] = [];
  for (let i = 0; i < args.length; i++) {
    const arg = args[i];
    if (!arg.startsWith("--")) {
      files.push(arg);
      continue;
    }
    const name = arg.slice(2);
    const kind = declared[name];
    if (!kind) throw new UsageError(`unknown option ${arg}`);
    if (kind === "switch") {
      flags[name] = true;
      continue;
    }
    const text = args[++i];
    if (text === undefined) throw new UsageError(`${arg} needs a value`);
    if (kind === "settings") {
      const settings = (flags[name] ??= { parameters: {}, initial: {} }) as Settings;
      addSetting(settings, text);
      continue;
    }
    if (kind === "text") {
      flags[name] = text;
      continue;
    }
    if (kind === "texts") {
      ((flags[name] ??= []) as string[]).push(text);
      continue;
    }
    if (kind === "method") {
      if (!(METHODS as readonly string[]).includes(text)) throw new UsageError(`${arg} takes one of ${METHODS.join(", ")}`);
      flags[name] = text;
      continue;
    }
    const value = Number(text);
    if (text.trim() === "" || !Number.isFinite(value) || (kind === "integer" && !Number.isInteger(value))) {
      throw new UsageError(`${arg} takes ${kind === "integer" ? "a whole number" : "a number"}, not "${text}"`);
    }
    flags[name] = value;
  }
  if (files.length !== 1) throw new UsageError(files.length === 0 ? "no FILE given" : "give exactly one FILE");
  return { file: files[0], flags };
}

/** The file's text; a file that cannot be read is bad usage. */
export async function readSource(file: string): Promise<string> {
  try {
    return await readFile(file, "utf8");
  } catch (error) {
    throw new UsageError(`cannot read ${file}: ${(error as NodeJS.ErrnoException).code ?? (error as Error).message}`);
  }
}

/** Parses a mechanism with `--set` applied; a setting that names nothing in the text is bad usage. */
export function parseWithSettings(text: string, file: string, settings: Settings | undefined): ParseResult {
  const { unknown, ...parsed } = parseMechanismWithSettings(text, settings ?? { parameters: {}, initial: {} });
  if (unknown.length > 0) throw new UsageError(`--set ${unknown[0]}: ${file} has no such parameter or species`);
  return parsed;
}

