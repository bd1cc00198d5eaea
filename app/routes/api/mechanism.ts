import { analysisFor } from "~/utils/analysis.server";
import { jobOwner } from "~/utils/dynamics.server";
import { onlyMethods } from "~/utils/http";
import { requireRole } from "~/utils/permissions.server";
import type { Route } from "./+types/mechanism";

export const action = onlyMethods(["GET"]);

export async function loader(args: Route.LoaderArgs) {
  const { mechanism, role, user } = await requireRole(args, args.params.id, "viewer");
  return Response.json({
    id: mechanism.id,
    title: mechanism.title,
    summary: mechanism.summary,
    source: mechanism.source,
    role,
    updatedAt: mechanism.updatedAt,
    analysis: await analysisFor({ ...args, owner: jobOwner(args.context, user) }, mechanism.source),
  });
}
