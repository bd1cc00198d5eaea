// Data sets and fits for route modules: storage (server/db/fits.ts), running a fit as a queued job
// that is stored with the version it ran on and announced to the room, and applying its values.
import type { AppLoadContext } from "react-router";
import { z } from "zod";
import { dataSetTexts, finishFit, FitStorageError, insertFit } from "../../server/db/fits";
import { MAX_FIT_DATA_SETS, MAX_NAME_CHARS } from "~/chem/limits";
import { firstProblem } from "~/shared/fields";
import { dataSetField, fitSettings, overrides } from "~/shared/job-schemas";
import { httpError } from "./http";
import { jobOwner, modelFromSource, respondWithJob } from "./dynamics.server";

export { dataSetTexts, deleteDataSet, findFit, insertDataSet, listDataSets, listFits } from "../../server/db/fits";

/** Data set and fit ids are UUIDs; anything else names nothing (and never reaches PostgreSQL). */
export const idField = z.guid("Ids of data sets and fits are UUIDs, as the lists give them.");

/** `POST …/fits`: stored data sets by id and/or CSV texts sent along, what to vary, bounds, values set for the run. */
export const fitRequest = fitSettings.omit({ data: true }).extend({
  dataSets: z.array(idField).max(MAX_FIT_DATA_SETS, `A fit reads at most ${MAX_FIT_DATA_SETS} data sets.`).default([]),
  data: z.array(dataSetField).max(MAX_FIT_DATA_SETS, `A fit reads at most ${MAX_FIT_DATA_SETS} data sets.`).default([]),
  set: overrides.optional(),
});
export type FitRequest = z.infer<typeof fitRequest>;

/** The API's error for a storage refusal (a FitStorageError); anything else is rethrown as it is. */
export function storageFailure(error: unknown): Response {
  if (error instanceof Error && error.name === "FitStorageError") return httpError((error as FitStorageError).code, error.message);
  throw error;
}

interface FitCaller {
  request: Request;
  context: AppLoadContext;
  mechanism: { id: string; source: string };
  user: { id: string; name: string };
}

/**
 * Runs a fit on the mechanism's current text: recorded as running (with the newest version), announced to
 * the room, run on the queue like every dynamics job, then stored with its result or error and announced again.
 */
export async function runFit({ request, context, mechanism, user }: FitCaller, body: FitRequest): Promise<Response> {
  let stored: { id: string; name: string; csv: string }[];
  try {
    stored = await dataSetTexts(context.db, mechanism.id, body.dataSets);
  } catch (error) {
    return storageFailure(error);
  }
  const data = [...stored.map(({ name, csv }) => ({ name, csv })), ...body.data];
  const settings = fitSettings.safeParse({ vary: body.vary, bounds: body.bounds, data });
  if (!settings.success) return httpError("bad_input", firstProblem(settings.error));
  const recorded = {
    vary: body.vary,
    bounds: body.bounds ?? {},
    set: body.set ?? { parameters: {}, initial: {} },
    dataSets: data.map(({ name }, index) => ({ id: stored[index]?.id ?? null, name: name.slice(0, MAX_NAME_CHARS) })),
  };
  const source = mechanism.source;
  const fit = await insertFit(context.db, { mechanismId: mechanism.id, source, ranBy: user.id, dataSetIds: body.dataSets, settings: recorded });
  const announce = (status: "running" | "done" | "failed") =>
    context.collab.announceFit(mechanism.id, fit.id, { status, at: new Date().toISOString(), by: user.name }).catch((error: unknown) => console.warn(`[fits] announcing ${fit.id}: ${String(error)}`));
  await announce("running");
  const job = { kind: "fit" as const, model: modelFromSource(source, body.set), options: settings.data };
  return respondWithJob(request, context, jobOwner(context, user), job, {
    async done(result) {
      await finishFit(context.db, mechanism.id, fit.id, { result });
      await announce("done");
      return { id: fit.id, snapshotId: fit.snapshotId, ...(result as object) };
    },
    async failed(failure) {
      await finishFit(context.db, mechanism.id, fit.id, { error: failure?.message ?? "The fit failed on the server." });
      await announce("failed");
    },
  });
}

/** "fitted to A, B and C", cut to a version name's length. */
export function fittedVersionName(dataSetNames: string[]): string {
  const names = dataSetNames.length > 1 ? `${dataSetNames.slice(0, -1).join(", ")} and ${dataSetNames[dataSetNames.length - 1]}` : (dataSetNames[0] ?? "inline data");
  const name = `fitted to ${names}`;
  return name.length <= MAX_NAME_CHARS ? name : `${name.slice(0, MAX_NAME_CHARS - 1)}…`;
}
