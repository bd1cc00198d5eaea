import { z } from "zod";
import { listViewLinks } from "~/utils/mechanisms.server";
import { labelField } from "~/shared/fields";
import { httpError, methodNotAllowed } from "~/utils/http";
import { readJson } from "~/utils/json.server";
import { requireRole } from "~/utils/permissions.server";
import { makeViewLink } from "~/utils/sharing.server";
import type { Route } from "./+types/view-links";

const body = z.object({
  expiresAt: z.iso.datetime({ offset: true, message: "expiresAt must be an ISO 8601 date-time." }).optional(),
  label: labelField.optional(),
});

export async function loader(args: Route.LoaderArgs) {
  const { mechanism } = await requireRole(args, args.params.id, "owner");
  return Response.json({ viewLinks: await listViewLinks(args.context.db, mechanism.id) });
}

export async function action(args: Route.ActionArgs) {
  if (args.request.method !== "POST") return methodNotAllowed(["GET", "POST"], "Use POST to create a view link.");
  const { mechanism, user } = await requireRole(args, args.params.id, "owner");
  const input = await readJson(args.request, body);
  const expiresAt = input.expiresAt ? new Date(input.expiresAt) : undefined;
  if (expiresAt && expiresAt <= new Date()) return httpError("bad_input", "expiresAt must be in the future.");
  const link = await makeViewLink(args.context, args.request, user, mechanism.id, { expiresAt, label: input.label });
  return Response.json(link, { status: 201 });
}
