// GET /api/v1/mechanisms/:id/fits — the fits, newest first, with their results (viewer);
// POST { dataSets?, data?, vary, bounds?, set? } — runs a fit on the current text (editor): the
// answer is the command line's `fit --json` plus the fit's id (progress lines with Accept: application/x-ndjson).
import { fitRequest, listFits, runFit } from "~/utils/fits.server";
import { methodNotAllowed } from "~/utils/http";
import { readJson } from "~/utils/json.server";
import { requireRole } from "~/utils/permissions.server";
import type { Route } from "./+types/fits";

export async function loader(args: Route.LoaderArgs) {
  const { mechanism } = await requireRole(args, args.params.id, "viewer");
  return Response.json({ fits: await listFits(args.context.db, mechanism.id) });
}

export async function action(args: Route.ActionArgs) {
  if (args.request.method !== "POST") return methodNotAllowed(["GET", "POST"], "Use POST with { dataSets or data, vary } to run a fit.");
  const { mechanism, user } = await requireRole(args, args.params.id, "editor");
  const body = await readJson(args.request, fitRequest);
  return runFit({ request: args.request, context: args.context, mechanism, user }, body);
}
