// The page's door to the reading worker. A 500-step text takes tens of milliseconds to parse,
// which on the main thread would stall typing; the worker parses instead. Requests of one kind
// never pile up: while one is being read, only the newest text waits, and every caller whose
// text was overtaken gets the newest answer (CodeMirror drops answers for a text it no longer
// shows). Without workers (server rendering, unit tests) the text is read in place.
import type { Diagnostic } from "@codemirror/lint";
import { parseMechanism } from "~/chem/parse";
import { diagnosticsOf, type MechanismNames, namesOf } from "./text-reading";

interface Answers {
  diagnostics: Diagnostic[];
  names: MechanismNames;
}
type Want = keyof Answers;

export interface ReadRequest {
  id: number;
  want: Want;
  source: string;
}

export type ReadAnswer = { id: number } & ({ diagnostics: Diagnostic[] } | { names: MechanismNames });

interface Caller {
  resolve(answer: unknown): void;
  reject(error: unknown): void;
}

interface Lane {
  /** The request the worker is reading, with everyone waiting on it. */
  reading: { id: number; callers: Caller[] } | null;
  /** The newest text not yet sent, with everyone waiting on it. */
  queued: { source: string; callers: Caller[] } | null;
}

let worker: Worker | null = null;
let lastId = 0;
const lanes: Record<Want, Lane> = { diagnostics: { reading: null, queued: null }, names: { reading: null, queued: null } };

/** Reads `source` for `want` off the main thread where the browser allows it. */
export function readMechanismText<W extends Want>(want: W, source: string): Promise<Answers[W]> {
  if (typeof Worker === "undefined") return Promise.resolve(readInPlace(want, source));
  return new Promise((resolve, reject) => {
    const lane = lanes[want];
    const callers = [...(lane.queued?.callers ?? []), { resolve: resolve as Caller["resolve"], reject }];
    lane.queued = { source, callers };
    if (!lane.reading) sendQueued(want);
  });
}

function readInPlace<W extends Want>(want: W, source: string): Answers[W] {
  const parsed = parseMechanism(source);
  return (want === "diagnostics" ? diagnosticsOf(parsed, source) : namesOf(parsed)) as Answers[W];
}

function sendQueued(want: Want) {
  const lane = lanes[want];
  if (!lane.queued) return;
  const { source, callers } = lane.queued;
  lane.queued = null;
  lane.reading = { id: ++lastId, callers };
  readingWorker().postMessage({ id: lane.reading.id, want, source } satisfies ReadRequest);
}

function readingWorker(): Worker {
  if (worker) return worker;
  worker = new Worker(new URL("./text-reader.worker.ts", import.meta.url), { type: "module", name: "mechanism text reader" });
  worker.onmessage = ({ data }: MessageEvent<ReadAnswer>) => {
    const want: Want = "diagnostics" in data ? "diagnostics" : "names";
    const lane = lanes[want];
    if (lane.reading?.id !== data.id) return;
    const { callers } = lane.reading;
    lane.reading = null;
    for (const caller of callers) caller.resolve("diagnostics" in data ? data.diagnostics : data.names);
    sendQueued(want);
  };
  // A worker that fails is dropped with its requests; the next request starts a fresh one.
  worker.onerror = (event) => {
    event.preventDefault();
    worker?.terminate();
    worker = null;
    for (const want of ["diagnostics", "names"] as const) {
      const lane = lanes[want];
      for (const caller of [...(lane.reading?.callers ?? []), ...(lane.queued?.callers ?? [])]) caller.reject(new Error(`reading the text failed: ${event.message}`));
      lane.reading = lane.queued = null;
    }
  };
  return worker;
}
