// Measured time courses in and simulated ones out, as CSV: a `time` column plus one column per
// species. Reading is strict and explains itself (which line, which column), because the file
// comes from a spreadsheet the user can fix. Comparison interpolates the simulation linearly at
// the measured times.

import Papa from "papaparse";
import { fromSpreadsheetText, spreadsheetText } from "~/chem/exchange/csv";
import { byteSize, MAX_CSV_BYTES, MAX_CSV_ROWS } from "~/chem/limits";

export interface MeasuredCourses {
  time: number[];
  /** One entry per time; null where the cell was left empty (not measured then). */
  series: Record<string, (number | null)[]>;
}

export class CsvError extends Error {
  override name = "CsvError";
}

export interface ReadOptions {
  /** Species of the model: other columns are reported and dropped. */
  species?: readonly string[];
  /** The header's line in the whole file, when lines above it were read elsewhere (default 1). */
  headerLine?: number;
}

export function readMeasuredCsv(text: string, options: ReadOptions = {}): { data: MeasuredCourses; warnings: string[] } {
  if (new TextEncoder().encode(text).length > MAX_CSV_BYTES) throw new CsvError(`the file is larger than ${byteSize(MAX_CSV_BYTES)}`);
  const parsed = Papa.parse<string[]>(text.replace(/^\uFEFF/, ""), { skipEmptyLines: "greedy" });
  const fatal = parsed.errors.find((e) => e.type === "Quotes");
  if (fatal) throw new CsvError(`line ${(fatal.row ?? 0) + 1}: ${fatal.message}`);
  const [header, ...rows] = parsed.data;
  if (!header || rows.length === 0) throw new CsvError("the file needs a header line and at least one line of data");
  if (rows.length > MAX_CSV_ROWS) throw new CsvError(`the file has more than ${MAX_CSV_ROWS} lines of data`);

  const names = header.map((name) => fromSpreadsheetText(name.trim()));
  const timeColumn = names.findIndex((name) => /^(time|t)$/i.test(name));
  if (timeColumn < 0) throw new CsvError('the header needs a "time" column');
  const seen = new Set<string>();
  for (const name of names) {
    if (name === "") throw new CsvError("a column in the header has no name");
    if (seen.has(name)) throw new CsvError(`the column "${name}" appears twice`);
    seen.add(name);
  }
  const warnings: string[] = [];
  const kept = names
    .map((name, column) => ({ name, column }))
    .filter(({ name, column }) => {
      if (column === timeColumn) return false;
      if (options.species && !options.species.includes(name)) {
        warnings.push(`the column "${name}" is not a species of this model and was ignored`);
        return false;
      }
      return true;
    });
  if (kept.length === 0) throw new CsvError("no column names a species of the model");

  const time: number[] = [];
  const series: Record<string, (number | null)[]> = Object.fromEntries(kept.map(({ name }) => [name, []]));
  rows.forEach((row, r) => {
    const line = r + (options.headerLine ?? 1) + 1;
    if (row.length !== names.length) throw new CsvError(`line ${line}: expected ${names.length} cells, found ${row.length}`);
    const t = cellNumber(row[timeColumn], line, names[timeColumn]);
    if (t === null) throw new CsvError(`line ${line}: the time is missing`);
    if (time.length > 0 && t <= time[time.length - 1]) throw new CsvError(`line ${line}: times must increase from line to line`);
    time.push(t);
    for (const { name, column } of kept) {
      const value = cellNumber(row[column], line, name);
      if (value !== null && value < 0) throw new CsvError(`line ${line}, column "${name}": a concentration cannot be negative`);
      series[name].push(value);
    }
  });
  return { data: { time, series }, warnings };
}

function cellNumber(cell: string, line: number, column: string): number | null {
  const text = cell.trim();
  if (text === "") return null;
  const value = Number(text);
  if (!Number.isFinite(value)) throw new CsvError(`line ${line}, column "${column}": "${text}" is not a number`);
  return value;
}

export interface SimulatedCourses {
  t: number[];
  series: Record<string, number[]>;
}

export interface SpeciesResidual {
  /** Measured points inside the simulated time span. */
  points: number;
  /** Root-mean-square of measured − simulated. */
  rms: number;
  residuals: { t: number; measured: number; simulated: number }[];
}

/** Residuals of each measured species against the simulation, linearly interpolated. */
export function residuals(measured: MeasuredCourses, simulated: SimulatedCourses): Record<string, SpeciesResidual> {
  const result: Record<string, SpeciesResidual> = {};
  for (const [name, values] of Object.entries(measured.series)) {
    const course = simulated.series[name];
    if (!course) continue;
    const list: SpeciesResidual["residuals"] = [];
    measured.time.forEach((t, i) => {
      const value = values[i];
      const at = interpolate(simulated.t, course, t);
      if (value !== null && at !== null) list.push({ t, measured: value, simulated: at });
    });
    const squares = list.reduce((sum, r) => sum + (r.measured - r.simulated) ** 2, 0);
    result[name] = { points: list.length, rms: list.length ? Math.sqrt(squares / list.length) : Number.NaN, residuals: list };
  }
  return result;
}

/** x at time `at`, linearly between samples; null outside [t₀, t_end]. */
export function interpolate(t: readonly number[], x: readonly number[], at: number): number | null {
  if (at < t[0] || at > t[t.length - 1]) return null;
  let low = 0;
  let high = t.length - 1;
  while (high - low > 1) {
    const middle = (low + high) >> 1;
    if (t[middle] <= at) low = middle;
    else high = middle;
  }
  if (t[high] === t[low]) return x[low];
  const fraction = (at - t[low]) / (t[high] - t[low]);
  return x[low] + fraction * (x[high] - x[low]);
}

/** A simulation as CSV: `time` then one column per species (names safe from formulas), full double precision. */
export function simulationCsv(simulated: SimulatedCourses): string {
  const names = Object.keys(simulated.series);
  const data = simulated.t.map((t, i) => [t, ...names.map((name) => simulated.series[name][i])]);
  return Papa.unparse({ fields: ["time", ...names.map(spreadsheetText)], data }, { newline: "\n" }) + "\n";
}
