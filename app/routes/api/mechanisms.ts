import { z } from "zod";
import { createMechanism, listMechanismsFor } from "~/utils/mechanisms.server";
import { requireUser } from "~/utils/auth.server";
import { sourceField, summaryField, titleField } from "~/shared/fields";
import { methodNotAllowed } from "~/utils/http";
import { readJson } from "~/utils/json.server";
import type { Route } from "./+types/mechanisms";

export async function loader(args: Route.LoaderArgs) {
  const user = await requireUser(args);
  const mechanisms = await listMechanismsFor(args.context.db, user.id);
  return Response.json({ mechanisms });
}

const createBody = z.object({ title: titleField, source: sourceField.optional(), summary: summaryField.optional() });

export async function action(args: Route.ActionArgs) {
  if (args.request.method !== "POST") return methodNotAllowed(["GET", "POST"], "Use POST to create a mechanism.");
  const user = await requireUser(args);
  const body = await readJson(args.request, createBody);
  const row = await createMechanism(args.context.db, user.id, body);
  return Response.json({ id: row.id, title: row.title, summary: row.summary, source: row.source, role: "owner", createdAt: row.createdAt }, { status: 201 });
}
