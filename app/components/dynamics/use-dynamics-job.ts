// Runs a dynamics job on the server with its place in the queue and live progress
// (newline-delimited JSON), and lets the reader cancel it: aborting the request stops the worker
// on the server too, or takes the job out of the queue.
import { useCallback, useRef, useState } from "react";
import type { FitProgress } from "~/chem/fit/types";

export interface JobState<T> {
  running: boolean;
  progress: number;
  /** The job's place in the server's queue while it waits; null once it runs. */
  queued: number | null;
  /** A fit's iterations so far with their cost, in order; empty for other jobs. */
  notes: FitProgress[];
  result: T | null;
  error: string | null;
}

/** `url` is the endpoint that runs the job (a mechanism's dynamics, or free-standing text). */
export function useDynamicsJob<T>(url: string) {
  const [state, setState] = useState<JobState<T>>({ running: false, progress: 0, queued: null, notes: [], result: null, error: null });
  const controller = useRef<AbortController | null>(null);

  const run = useCallback(
    async (body: unknown) => {
      controller.current?.abort();
      const abort = (controller.current = new AbortController());
      setState((s) => ({ ...s, running: true, progress: 0, queued: null, notes: [], error: null }));
      try {
        const response = await fetch(url, {
          method: "POST",
          headers: { "Content-Type": "application/json", Accept: "application/x-ndjson" },
          body: JSON.stringify(body),
          signal: abort.signal,
        });
        if (!response.ok || !response.body) {
          const message = (await response.json().catch(() => null))?.error ?? `The server answered ${response.status}.`;
          setState((s) => ({ ...s, running: false, queued: null, error: message }));
          return;
        }
        const reader = response.body.pipeThrough(new TextDecoderStream()).getReader();
        let buffer = "";
        for (;;) {
          const { value, done } = await reader.read();
          if (done) break;
          buffer += value;
          const lines = buffer.split("\n");
          buffer = lines.pop() ?? "";
          for (const line of lines.filter(Boolean)) {
            const message = JSON.parse(line) as { queued?: number; progress?: number; note?: FitProgress; result?: T; error?: string };
            if (message.queued !== undefined) setState((s) => ({ ...s, queued: message.queued! }));
            if (message.progress !== undefined)
              setState((s) => ({ ...s, queued: null, progress: message.progress!, notes: message.note ? withNote(s.notes, message.note) : s.notes }));
            if (message.result !== undefined) setState((s) => ({ running: false, progress: 1, queued: null, notes: s.notes, result: message.result!, error: null }));
            if (message.error !== undefined) setState((s) => ({ ...s, running: false, queued: null, error: message.error! }));
          }
        }
      } catch (error) {
        if ((error as Error).name === "AbortError") setState((s) => ({ ...s, running: false, queued: null, error: "Cancelled." }));
        else setState((s) => ({ ...s, running: false, queued: null, error: "The connection to the server was lost." }));
      }
    },
    [url],
  );

  const cancel = useCallback(() => controller.current?.abort(), []);
  return { ...state, run, cancel };
}

/** Notes in iteration order: events may overtake one another between the worker's process and this one. */
export function withNote(notes: FitProgress[], note: FitProgress): FitProgress[] {
  if (notes.some(({ iteration }) => iteration === note.iteration)) return notes;
  return [...notes, note].sort((a, b) => a.iteration - b.iteration);
}
