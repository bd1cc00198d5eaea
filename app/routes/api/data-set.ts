// GET /api/v1/mechanisms/:id/data-sets/:dataSetId — the CSV as uploaded (viewer); DELETE (editor).
import { dataSetTexts, deleteDataSet, idField, storageFailure } from "~/utils/fits.server";
import { httpError, methodNotAllowed } from "~/utils/http";
import { requireRole } from "~/utils/permissions.server";
import type { Route } from "./+types/data-set";

const notFound = () => httpError("not_found", "No data set with that id belongs to this mechanism.");

export async function loader(args: Route.LoaderArgs) {
  const { mechanism } = await requireRole(args, args.params.id, "viewer");
  if (!idField.safeParse(args.params.dataSetId).success) return notFound();
  try {
    const [dataSet] = await dataSetTexts(args.context.db, mechanism.id, [args.params.dataSetId]);
    return new Response(dataSet.csv, { headers: { "Content-Type": "text/csv; charset=utf-8" } });
  } catch (error) {
    return storageFailure(error);
  }
}

export async function action(args: Route.ActionArgs) {
  if (args.request.method !== "DELETE") return methodNotAllowed(["GET", "DELETE"]);
  const { mechanism } = await requireRole(args, args.params.id, "editor");
  if (!idField.safeParse(args.params.dataSetId).success) return notFound();
  if (!(await deleteDataSet(args.context.db, mechanism.id, args.params.dataSetId))) return notFound();
  return new Response(null, { status: 204 });
}
