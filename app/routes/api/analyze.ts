import { z } from "zod";
import { analysisFor } from "~/utils/analysis.server";
import { checkSourceLimits } from "~/chem/limits";
import { requireUser } from "~/utils/auth.server";
import { cleanText } from "~/utils/fields";
import { httpError } from "~/utils/http";
import { readJson } from "~/utils/json.server";
import type { Route } from "./+types/analyze";

export async function action(args: Route.ActionArgs) {
  if (args.request.method !== "POST") return httpError(405, "Use POST with { \"source\" }.");
  await requireUser(args);
  const { source } = await readJson(args.request, z.object({ source: cleanText("The mechanism text") }));
  const refusal = checkSourceLimits(source);
  if (refusal) return httpError(413, refusal);
  return Response.json(await analysisFor(args.context, source));
}
