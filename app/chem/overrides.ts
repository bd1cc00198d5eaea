// Values given from outside a text for one run (the CLI's `--set`, the Dynamics panel's overrides):
// `NAME=VALUE` replaces a parameter, `[X]0=VALUE` (or `["Fe3+"]0=VALUE`) an initial concentration.
import type { Settings } from "./parse";

export type OverrideReading = { ok: true; into: keyof Settings; name: string; value: number } | { ok: false; message: string };

const pattern = /^\s*(?:\[\s*(?:"([^"]+)"|([A-Za-z][A-Za-z0-9_]*))\s*\]0|([A-Za-z][A-Za-z0-9_]*))\s*=(.*)$/;

export function readOverride(text: string): OverrideReading {
  const match = pattern.exec(text);
  if (!match) return { ok: false, message: `write NAME=VALUE or [SPECIES]0=VALUE, not "${text}"` };
  const [, quoted, species, parameter, valueText] = match;
  const value = Number(valueText);
  if (valueText.trim() === "" || !Number.isFinite(value) || value < 0) return { ok: false, message: `${text}: the value must be a number ≥ 0` };
  return parameter ? { ok: true, into: "parameters", name: parameter, value } : { ok: true, into: "initial", name: quoted ?? species, value };
}

/** Every override applied in order (a later one wins); the first unreadable one is reported. */
export function readOverrides(texts: string[]): { ok: true; settings: Settings } | { ok: false; message: string } {
  const settings: Settings = { parameters: {}, initial: {} };
  for (const text of texts) {
    const reading = readOverride(text);
    if (!reading.ok) return reading;
    settings[reading.into][reading.name] = reading.value;
  }
  return { ok: true, settings };
}
