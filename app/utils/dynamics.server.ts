// Runs a dynamics job for an HTTP caller in a worker thread. A plain JSON caller gets the result;
// a caller that asks for `application/x-ndjson` gets progress lines while it runs, then the
// result — and closing the request cancels the run.
import type { AppLoadContext } from "react-router";
import type { DynamicsModel, WorkerJob } from "../../server/sim/job";
import { buildNetwork } from "~/chem/network";
import { parseOde } from "~/chem/ode/parse";
import { parseMechanism } from "~/chem/parse";
import { httpError } from "./http";

/** The mechanism text as a dynamics model, or a 400 naming the first error in it. */
export function modelFromSource(source: string): DynamicsModel {
  const parsed = parseMechanism(source);
  const error = parsed.diagnostics.find((d) => d.severity === "error");
  if (error) throw httpError(400, `Fix the mechanism first: line ${error.line}, column ${error.column}: ${error.message}`);
  return { kind: "mechanism", mechanism: parsed.mechanism, network: buildNetwork(parsed.mechanism) };
}

/** A polynomial ODE text as a dynamics model, or a 400 naming the first error in it. */
export function modelFromOde(text: string): DynamicsModel {
  const parsed = parseOde(text);
  const error = parsed.diagnostics.find((d) => d.severity === "error");
  if (error || !parsed.ode) throw httpError(400, `Fix the ODE first: line ${error?.line ?? 1}: ${error?.message ?? "it has no equations"}`);
  return { kind: "ode", ode: parsed.ode };
}

const statusOf: Record<string, number> = { SimulationInputError: 400, RealizeRequestError: 400, SimulationLimitError: 413, IntegrationFailure: 422, SimulationCancelled: 499 };

function failure(error: unknown): { status: number; message: string } {
  if (error instanceof Error && error.name in statusOf) {
    // A run stopped by its time limit is the server's limit, not too large an input.
    const status = (error as { limit?: string }).limit === "time" ? 503 : statusOf[error.name];
    const message = error.message.charAt(0).toUpperCase() + error.message.slice(1);
    return { status, message: message.endsWith(".") ? message : `${message}.` };
  }
  throw error;
}

export async function respondWithJob(request: Request, context: AppLoadContext, job: WorkerJob): Promise<Response> {
  if (!(request.headers.get("Accept") ?? "").includes("application/x-ndjson")) {
    try {
      return Response.json(await context.dynamics.run(job, { signal: request.signal }));
    } catch (error) {
      const { status, message } = failure(error);
      return httpError(status, message);
    }
  }
  const encoder = new TextEncoder();
  const stream = new ReadableStream<Uint8Array>({
    async start(controller) {
      const send = (value: unknown) => controller.enqueue(encoder.encode(JSON.stringify(value) + "\n"));
      let lastSent = -1;
      try {
        const result = await context.dynamics.run(job, {
          signal: request.signal,
          onProgress(fraction) {
            // About one line per percent is plenty for a progress bar.
            if (fraction - lastSent < 0.01 && fraction < 1) return;
            lastSent = fraction;
            send({ progress: fraction });
          },
        });
        send({ result });
      } catch (error) {
        try {
          send({ error: failure(error).message });
        } catch (unexpected) {
          console.error(unexpected);
          send({ error: "The run failed on the server." });
        }
      }
      controller.close();
    },
  });
  return new Response(stream, { headers: { "Content-Type": "application/x-ndjson", "Cache-Control": "no-store" } });
}
