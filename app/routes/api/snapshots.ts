// GET /api/v1/mechanisms/:id/snapshots — the versions, newest first (viewer);
// POST { "name" } — names the current version (editor).
import { z } from "zod";
import { snapshotNameField } from "~/shared/fields";
import { listSnapshots } from "~/utils/mechanisms.server";
import { httpError, methodNotAllowed } from "~/utils/http";
import { readJson } from "~/utils/json.server";
import { requireRole } from "~/utils/permissions.server";
import type { Route } from "./+types/snapshots";

export async function loader(args: Route.LoaderArgs) {
  const { mechanism } = await requireRole(args, args.params.id, "viewer");
  return Response.json({ snapshots: await listSnapshots(args.context.db, mechanism.id) });
}

const body = z.object({ name: snapshotNameField });

export async function action(args: Route.ActionArgs) {
  if (args.request.method !== "POST") return methodNotAllowed(["GET", "POST"], 'Use POST with { "name" } to name the current version.');
  const { mechanism, user } = await requireRole(args, args.params.id, "editor");
  const { name } = await readJson(args.request, body);
  const snapshot = await args.context.collab.createNamedSnapshot(mechanism.id, user.id, name);
  if (!snapshot) return httpError("not_found", "No mechanism with that id is visible to you.");
  return Response.json({ snapshot: { ...snapshot, kind: "named", name } }, { status: 201 });
}
