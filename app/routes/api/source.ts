// PUT /api/v1/mechanisms/:id/source — the whole text, written through the live document so
// everyone in the room sees it at once.
import { z } from "zod";
import { MAX_SOURCE_BYTES } from "~/chem/limits";
import { cleanText, oversizedSourceMessage } from "~/shared/fields";
import { httpError, methodNotAllowed, onlyMethods } from "~/utils/http";
import { readJson } from "~/utils/json.server";
import { requireRole } from "~/utils/permissions.server";
import type { Route } from "./+types/source";

const body = z.object({ source: cleanText("The mechanism text") });

const allowed = ["PUT"];
const hint = 'Use PUT with { "source" }.';
export const loader = onlyMethods(allowed, hint);

export async function action(args: Route.ActionArgs) {
  if (args.request.method !== "PUT") return methodNotAllowed(allowed, hint);
  const { mechanism, user } = await requireRole(args, args.params.id, "editor");
  const { source } = await readJson(args.request, body);
  if (Buffer.byteLength(source, "utf8") > MAX_SOURCE_BYTES) return httpError("too_large", oversizedSourceMessage);
  if (!(await args.context.collab.replaceSource(mechanism.id, source, user.id))) return httpError("not_found", "No mechanism with that id is visible to you.");
  return Response.json({ id: mechanism.id, source });
}
