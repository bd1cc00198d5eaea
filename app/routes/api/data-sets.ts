// GET /api/v1/mechanisms/:id/data-sets — the stored data sets (viewer);
// POST with a CSV body (Content-Type: text/csv) and ?name= — stores one (editor).
import { byteSize, MAX_CSV_BYTES } from "~/chem/limits";
import { dataSetField } from "~/shared/job-schemas";
import { firstProblem } from "~/shared/fields";
import { dataSetCheckFor } from "~/utils/analysis.server";
import { jobOwner } from "~/utils/dynamics.server";
import { insertDataSet, listDataSets, storageFailure } from "~/utils/fits.server";
import { httpError, methodNotAllowed } from "~/utils/http";
import { requireRole } from "~/utils/permissions.server";
import type { Route } from "./+types/data-sets";

const hint = "Use POST with the CSV as the body (Content-Type: text/csv) and the data set's name as ?name=.";

export async function loader(args: Route.LoaderArgs) {
  const { mechanism } = await requireRole(args, args.params.id, "viewer");
  return Response.json({ dataSets: await listDataSets(args.context.db, mechanism.id) });
}

export async function action(args: Route.ActionArgs) {
  const { request, context } = args;
  if (request.method !== "POST") return methodNotAllowed(["GET", "POST"], hint);
  const { mechanism, user } = await requireRole(args, args.params.id, "editor");
  const mediaType = (request.headers.get("Content-Type") ?? "").split(";")[0].trim().toLowerCase();
  if (mediaType !== "text/csv") return httpError("unsupported_media_type", hint);
  const oversized = `A data set is at most ${byteSize(MAX_CSV_BYTES)} of CSV.`;
  if (Number(request.headers.get("Content-Length") ?? 0) > MAX_CSV_BYTES) return httpError("too_large", oversized);
  const bytes = new Uint8Array(await request.arrayBuffer());
  if (bytes.byteLength > MAX_CSV_BYTES) return httpError("too_large", oversized);
  let csv: string;
  try {
    csv = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    return httpError("bad_input", "The CSV is not UTF-8 text.");
  }
  const checked = dataSetField.safeParse({ name: new URL(request.url).searchParams.get("name") ?? "", csv });
  if (!checked.success) return httpError("bad_input", firstProblem(checked.error));
  const read = await dataSetCheckFor({ request, context, owner: jobOwner(context, user) }, csv);
  if ("refusal" in read) return httpError("bad_input", `This CSV cannot be read as a data set: ${read.refusal}.`);
  try {
    const dataSet = await insertDataSet(context.db, mechanism.id, user.id, checked.data);
    return Response.json({ dataSet: { ...dataSet, columns: read.columns, rows: read.rows }, warnings: read.warnings }, { status: 201 });
  } catch (error) {
    return storageFailure(error);
  }
}
