// The editor's reading worker: parses the text of every request off the page's main thread,
// incrementally (a keystroke reparses only what it changed), and answers with what was asked.
import { IncrementalMechanismParser } from "~/chem/parse";
import { diagnosticsOf, namesOf } from "./text-reading";
import type { ReadAnswer, ReadRequest } from "./text-reader";

const parser = new IncrementalMechanismParser();

self.onmessage = ({ data: { id, want, source } }: MessageEvent<ReadRequest>) => {
  const parsed = parser.parse(source);
  const answer: ReadAnswer = want === "diagnostics" ? { id, diagnostics: diagnosticsOf(parsed, source) } : { id, names: namesOf(parsed) };
  self.postMessage(answer);
};
