// GET /api/v1/mechanisms/:id/fits/:fitId — one fit: who ran it on which version, its settings, the text it ran on and its result (viewer).
import { findFit, idField } from "~/utils/fits.server";
import { httpError, onlyMethods } from "~/utils/http";
import { requireRole } from "~/utils/permissions.server";
import type { Route } from "./+types/fit";

export const action = onlyMethods(["GET"]);

export async function loader(args: Route.LoaderArgs) {
  const { mechanism } = await requireRole(args, args.params.id, "viewer");
  const fit = idField.safeParse(args.params.fitId).success ? await findFit(args.context.db, mechanism.id, args.params.fitId) : null;
  if (!fit) return httpError("not_found", "No fit with that id belongs to this mechanism.");
  return Response.json({ fit });
}
