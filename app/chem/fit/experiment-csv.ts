// One experiment from one CSV: the measured time courses (csv.ts reads them), preceded by comment
// lines that set what this experiment ran at — `# T = 350`, `# [A]0 = 0.002`, written as `--set`
// writes them — and optionally a standard deviation column `sd(A)` beside a species column `A`.
// Other comment lines are free text. Everything is checked against the model's species, because a
// column silently dropped from a fit changes the answer.

import { CsvError, readMeasuredCsv } from "~/chem/kinetics/csv";
import { readOverride } from "~/chem/overrides";
import type { Settings } from "~/chem/parse";
import type { Experiment } from "./types";

const SETTING_COMMENT = /^#\s*(\[[^\]]+\]0|[A-Za-z][A-Za-z0-9_]*)\s*=/;
const SD_COLUMN = /^sd\((.+)\)$/;

export function readExperimentCsv(text: string, name: string, options: { species?: readonly string[] } = {}): { experiment: Experiment; warnings: string[] } {
  const settings: Settings = { parameters: {}, initial: {} };
  const lines = text.replace(/^\uFEFF/, "").split(/\r?\n/);
  let header = 0;
  for (; header < lines.length; header++) {
    const line = lines[header].trim();
    if (line !== "" && !line.startsWith("#")) break;
    if (!SETTING_COMMENT.test(line)) continue;
    const reading = readOverride(line.slice(1).trim());
    if (!reading.ok) throw new CsvError(`line ${header + 1}: ${reading.message}`);
    settings[reading.into][reading.name] = reading.value;
  }
  const { data, warnings } = readMeasuredCsv(lines.slice(header).join("\n"), { headerLine: header + 1 });
  const measured: Experiment["series"] = {};
  const sd: NonNullable<Experiment["sd"]> = {};
  for (const [column, values] of Object.entries(data.series)) {
    const sdOf = SD_COLUMN.exec(column)?.[1];
    if (sdOf !== undefined) sd[sdOf] = values;
    else measured[column] = values;
  }
  for (const species of Object.keys(measured)) {
    if (options.species && !options.species.includes(species)) throw new CsvError(`the column "${species}" is not a species of the model`);
  }
  const weighted = Object.keys(sd);
  for (const species of weighted) {
    if (!(species in measured)) throw new CsvError(`the column "sd(${species})" has no column "${species}" beside it`);
    measured[species].forEach((value, i) => {
      const deviation = sd[species][i];
      if (value !== null && (deviation === null || deviation <= 0)) {
        throw new CsvError(`time ${data.time[i]}: "${species}" was measured but its standard deviation is missing or not positive`);
      }
    });
  }
  if (weighted.length > 0) {
    const unweighted = Object.keys(measured).filter((species) => !(species in sd));
    if (unweighted.length > 0) throw new CsvError(`give standard deviations for every species or for none: "sd(${unweighted[0]})" is missing`);
  }
  if (data.time[0] < 0) throw new CsvError("times must not be negative: every experiment starts at time 0");
  const experiment: Experiment = { name, settings, time: data.time, series: measured };
  // A deviation beside an empty cell weighs nothing: left out, so the schema's "positive" holds.
  if (weighted.length > 0) experiment.sd = Object.fromEntries(weighted.map((species) => [species, sd[species].map((d, i) => (measured[species][i] === null ? null : d))]));
  return { experiment, warnings };
}
