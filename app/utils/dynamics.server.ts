// Runs a job for an HTTP caller in a worker thread. A plain JSON caller gets the result; a caller
// that asks for `application/x-ndjson` gets its place in the queue and progress lines while it
// runs, then the result — and closing the request cancels the run.
import type { AppLoadContext } from "react-router";
import type { Settings } from "~/chem/parse";
import type { DynamicsModel, WorkerJob } from "../../server/sim/job";
import { httpError } from "./http";

/** The mechanism text as a dynamics model; the worker parses it (a 400 names its first error). */
/** `overrides` replace parameters and initial concentrations, as the CLI's `--set` does. */
export function modelFromSource(source: string, overrides?: Settings): DynamicsModel {
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

const statusOf: Record<string, number> = {
  SimulationInputError: 400,
  RealizeRequestError: 400,
  SimulationLimitError: 413,
  QueueFullError: 429,
  IntegrationFailure: 422,
  SimulationCancelled: 499,
};

/** The status and message for a job's error; null for an error nobody expected. */
export function jobFailure(error: unknown): { status: number; message: string; retryAfter?: number } | null {
  if (!(error instanceof Error) || !(error.name in statusOf)) return null;
  // A run stopped by its time limit is the server's limit, not too large an input.
  const status = (error as { limit?: string }).limit === "time" ? 503 : statusOf[error.name];
  const message = error.message.charAt(0).toUpperCase() + error.message.slice(1);
  return { status, message: message.endsWith(".") ? message : `${message}.`, retryAfter: (error as { retryAfter?: number }).retryAfter };
}

/** The `{ error }` response for a failure, with Retry-After when waiting helps. */
export function failureResponse({ status, message, retryAfter }: NonNullable<ReturnType<typeof jobFailure>>): Response {
  const response = httpError(status, message);
  if (retryAfter !== undefined) response.headers.set("Retry-After", String(retryAfter));
  return response;
}

export async function respondWithJob(request: Request, context: AppLoadContext, owner: string, job: WorkerJob): Promise<Response> {
  if (!(request.headers.get("Accept") ?? "").includes("application/x-ndjson")) {
    try {
      return Response.json(await context.dynamics.run(job, { signal: request.signal, owner }));
    } catch (error) {
      const failure = jobFailure(error);
      if (!failure) throw error;
      return failureResponse(failure);
    }
  }
  const encoder = new TextEncoder();
  let controller!: ReadableStreamDefaultController<Uint8Array>;
  const body = new ReadableStream<Uint8Array>({ start: (c) => void (controller = c) });
  const send = (value: unknown) => {
    // A reader that went away has cancelled the stream (and, through its signal, the job).
    if (!request.signal.aborted) controller.enqueue(encoder.encode(JSON.stringify(value) + "\n"));
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
    onProgress(fraction) {
      // About one line per percent is plenty for a progress bar.
      if (fraction - lastSent < 0.01 && fraction < 1) return;
      lastSent = fraction;
      send({ progress: fraction });
    },
  });
  // A job refused before it is queued (the caller's queue is full) answers with its own status.
  const refused = await Promise.race([queuedOrStarted.then(() => null), run.then(() => null, (error: unknown) => error)]);
  if (refused) {
    const failure = jobFailure(refused);
    if (!failure) throw refused;
    return failureResponse(failure);
  }
  void run
    .then(
      (result) => send({ result }),
      (error: unknown) => {
        const failure = jobFailure(error);
        if (!failure) console.error(error);
        send({ error: failure?.message ?? "The run failed on the server." });
      },
    )
    .finally(() => request.signal.aborted || controller.close());
  return new Response(body, { headers: { "Content-Type": "application/x-ndjson", "Cache-Control": "no-store" } });
}
