// Runs a job for an HTTP caller in a worker thread. A plain JSON caller gets the result; a caller
// that asks for `application/x-ndjson` gets its place in the queue and progress lines while it
// runs, then the result — and closing the request cancels the run.
import type { AppLoadContext } from "react-router";
import type { DynamicsModel, WorkerJob } from "../../server/sim/job";
import { codeOf, type ErrorCode } from "~/shared/error-codes";
import type { Overrides } from "~/shared/job-schemas";
import { httpError } from "./http";

/**
 * The mechanism text as a dynamics model; the worker parses it (a 400 names its first error).
 * `overrides` replace parameters and initial concentrations, as the CLI's `--set` does.
 */
export function modelFromSource(source: string, overrides?: Overrides): DynamicsModel {
  return overrides ? { kind: "text", source, overrides } : { kind: "text", source };
}

/** A polynomial ODE text as a dynamics model; the worker parses it (a 400 names its first error). */
export function modelFromOde(text: string): DynamicsModel {
  return { kind: "odeText", text };
}

/** Whose job it is, for the per-user cap: the user, or a signed-out guest's address. */
export function jobOwner(context: AppLoadContext, user: { id: string } | null): string {
  return user ? `user:${user.id}` : `guest:${context.clientAddress}`;
}

export interface JobFailure {
  code: ErrorCode;
  message: string;
  /** Seconds after which a retry may be admitted (a full queue). */
  retryAfter?: number;
}

/** The code and message for a job's error, as a sentence; null for an error nobody expected. */
export function jobFailure(error: unknown): JobFailure | null {
  const code = codeOf(error);
  if (!code) return null;
  const { message: text, retryAfter } = error as Error & { retryAfter?: number };
  const message = text.charAt(0).toUpperCase() + text.slice(1);
  return { code, message: message.endsWith(".") ? message : `${message}.`, retryAfter };
}

/** The error response for a failure, with Retry-After when waiting helps. */
export function failureResponse({ code, message, retryAfter }: JobFailure): Response {
  return httpError(code, message, retryAfter === undefined ? undefined : { "Retry-After": String(retryAfter) });
}

/** What a caller does with the outcome before it is sent: a fit stores it and answers with its id. */
export interface JobOutcome {
  /** The body sent for a result. */
  done(result: unknown): Promise<unknown>;
  /** Called for every failure, cancels included (`failure` is null for an error nobody expected). */
  failed(failure: JobFailure | null): Promise<void>;
}

const passThrough: JobOutcome = { done: async (result) => result, failed: async () => undefined };

export async function respondWithJob(request: Request, context: AppLoadContext, owner: string, job: WorkerJob, outcome: JobOutcome = passThrough): Promise<Response> {
  if (!(request.headers.get("Accept") ?? "").includes("application/x-ndjson")) {
    let result: unknown;
    try {
      result = await context.dynamics.run(job, { signal: request.signal, owner });
    } catch (error) {
      const failure = jobFailure(error);
      await outcome.failed(failure);
      if (!failure) throw error;
      return failureResponse(failure);
    }
    return Response.json(await outcome.done(result));
  }
  const encoder = new TextEncoder();
  let controller!: ReadableStreamDefaultController<Uint8Array>;
  const body = new ReadableStream<Uint8Array>({ start: (c) => void (controller = c) });
  // A reader that went away has cancelled the stream (and, through its signal, the job); the stream
  // may be cancelled a moment before the signal says so, and then there is nobody left to tell.
  const send = (value: unknown) => {
    if (request.signal.aborted) return;
    try {
      controller.enqueue(encoder.encode(JSON.stringify(value) + "\n"));
    } catch {
      // Cancelled by its reader.
    }
  };
  const close = () => {
    if (request.signal.aborted) return;
    try {
      controller.close();
    } catch {
      // Cancelled by its reader.
    }
  };
  let admitted!: () => void;
  const queuedOrStarted = new Promise<void>((resolve) => (admitted = resolve));
  let lastSent = -1;
  const run = context.dynamics.run(job, {
    signal: request.signal,
    owner,
    onStart: admitted,
    onQueued(position) {
      admitted();
      send({ queued: position });
    },
    onProgress(fraction, note) {
      // About one line per percent is plenty for a progress bar; a fit's every iteration is news.
      if (!note && fraction - lastSent < 0.01 && fraction < 1) return;
      lastSent = fraction;
      send(note ? { progress: fraction, note } : { progress: fraction });
    },
  });
  // A job refused before it is queued (the caller's queue is full) answers with its own status.
  const refused = await Promise.race([queuedOrStarted.then(() => null), run.then(() => null, (error: unknown) => error)]);
  if (refused) {
    const failure = jobFailure(refused);
    await outcome.failed(failure);
    if (!failure) throw refused;
    return failureResponse(failure);
  }
  void run
    .then(
      async (result) => send({ result: await outcome.done(result) }),
      async (error: unknown) => {
        const failure = jobFailure(error);
        if (!failure) console.error(error);
        await outcome.failed(failure);
        send(failure ? { error: failure.message, code: failure.code } : { error: "The run failed on the server." });
      },
    )
    .catch((error: unknown) => {
      console.error(error);
      send({ error: "The result could not be stored." });
    })
    .finally(close);
  return new Response(body, { headers: { "Content-Type": "application/x-ndjson", "Cache-Control": "no-store" } });
}
