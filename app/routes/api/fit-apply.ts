// POST /api/v1/mechanisms/:id/fits/:fitId/apply — writes the fitted values into the live text as
// one edit everyone in the room sees, and names the version "fitted to <data sets>" (editor). The
// answer's `previous` holds the values it replaced, so the page can undo the change in one step.
import { z } from "zod";
import { findFit, fittedVersionName, idField } from "~/utils/fits.server";
import { httpError, methodNotAllowed, onlyMethods } from "~/utils/http";
import { requireRole } from "~/utils/permissions.server";
import type { Route } from "./+types/fit-apply";

const allowed = ["POST"];
export const loader = onlyMethods(allowed, "Use POST to apply a fit's values.");

const storedFit = z.object({
  result: z.object({ parameters: z.record(z.string(), z.object({ value: z.number() })) }),
  settings: z.object({ dataSets: z.array(z.object({ name: z.string() })) }),
});

export async function action(args: Route.ActionArgs) {
  if (args.request.method !== "POST") return methodNotAllowed(allowed);
  const { mechanism, user } = await requireRole(args, args.params.id, "editor");
  const fit = idField.safeParse(args.params.fitId).success ? await findFit(args.context.db, mechanism.id, args.params.fitId) : null;
  if (!fit) return httpError("not_found", "No fit with that id belongs to this mechanism.");
  const done = storedFit.safeParse(fit);
  if (fit.status !== "done" || !done.success) return httpError("bad_input", "Only a finished fit has values to apply.");
  const values = Object.fromEntries(Object.entries(done.data.result.parameters).map(([name, { value }]) => [name, value]));
  const name = fittedVersionName(done.data.settings.dataSets.map((dataSet) => dataSet.name));
  const applied = await args.context.collab.applyValues(mechanism.id, user.id, values, name);
  if (!applied) return httpError("not_found", "No mechanism with that id is visible to you.");
  if (!applied.snapshot) {
    return httpError("bad_input", `The text no longer declares ${applied.undeclared.join(", ")} with a number (name = value); nothing was written.`);
  }
  return Response.json({ values, previous: applied.previous, snapshot: { ...applied.snapshot, kind: "named", name } }, { status: 201 });
}
