import { z } from "zod";
import { analysisFor } from "~/utils/analysis.server";
import { checkSourceLimits } from "~/chem/limits";
import { requireUser } from "~/utils/auth.server";
import { cleanText } from "~/shared/fields";
import { jobOwner } from "~/utils/dynamics.server";
import { httpError, methodNotAllowed, onlyMethods } from "~/utils/http";
import { readJson } from "~/utils/json.server";
import type { Route } from "./+types/analyze";

const allowed = ["POST"];
const hint = "Use POST with { \"source\" }.";
export const loader = onlyMethods(allowed, hint);

export async function action(args: Route.ActionArgs) {
  if (args.request.method !== "POST") return methodNotAllowed(allowed, hint);
  const user = await requireUser(args);
  const { source } = await readJson(args.request, z.object({ source: cleanText("The mechanism text") }));
  const refusal = checkSourceLimits(source);
  if (refusal) return httpError("too_large", refusal);
  return Response.json(await analysisFor({ ...args, owner: jobOwner(args.context, user) }, source));
}
