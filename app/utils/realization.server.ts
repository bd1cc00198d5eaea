// Runs a realization request (app/shared/job-schemas.ts `realizeRequest`) for the API and the page.
import type { AppLoadContext } from "react-router";
import type { RealizeRequest } from "~/shared/job-schemas";
import { jobOwner, respondWithJob } from "./dynamics.server";

/** The MILP searches share this budget (in a worker thread, so the server stays responsive). */
const EQUIVALENTS_TIME_LIMIT_MS = 20_000;

export function runRealization(request: Request, context: AppLoadContext, user: { id: string }, input: RealizeRequest): Promise<Response> {
  return respondWithJob(request, context, jobOwner(context, user), { kind: "realize", request: input, timeLimitMs: EQUIVALENTS_TIME_LIMIT_MS });
}
