// A mechanism as a file: SBML Level 3 Core, a LaTeX document, or its stoichiometric matrix as CSV.
import { exportFor } from "~/utils/analysis.server";
import { jobOwner } from "~/utils/dynamics.server";
import { httpError, onlyMethods } from "~/utils/http";
import { requireRole } from "~/utils/permissions.server";
import type { Route } from "./+types/export";

const formats = {
  sbml: { type: "application/sbml+xml; charset=utf-8", extension: "xml" },
  latex: { type: "application/x-tex; charset=utf-8", extension: "tex" },
  csv: { type: "text/csv; charset=utf-8", extension: "csv" },
} as const;

export const action = onlyMethods(["GET"], "Use GET with ?format=sbml, latex or csv.");

export async function loader(args: Route.LoaderArgs) {
  const { mechanism, user } = await requireRole(args, args.params.id, "viewer");
  const format = new URL(args.request.url).searchParams.get("format") ?? "";
  if (!Object.hasOwn(formats, format)) return httpError("bad_input", "Ask for format=sbml, latex or csv.");
  const chosen = formats[format as keyof typeof formats];
  const exported = await exportFor({ ...args, owner: jobOwner(args.context, user) }, mechanism.source, format as keyof typeof formats, mechanism.title);
  if ("refusal" in exported) return httpError(exported.tooLarge ? "too_large" : "bad_input", exported.refusal);
  const body = exported.body;
  const filename = `${mechanism.title.replace(/[^\w.-]+/g, "-").replace(/^-|-$/g, "") || mechanism.id}.${chosen.extension}`;
  return new Response(body, { headers: { "Content-Type": chosen.type, "Content-Disposition": `attachment; filename="${filename}"` } });
}
