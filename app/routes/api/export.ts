// A mechanism as a file: SBML Level 3 Core, a LaTeX document, or its stoichiometric matrix as CSV.
import { csvTooLarge, stoichiometricMatrixCsv } from "~/chem/exchange/csv";
import { exportLatex } from "~/chem/exchange/latex";
import { exportSbml } from "~/chem/exchange/sbml-export";
import { parseMechanism } from "~/chem/parse";
import { analysisFor } from "~/utils/analysis.server";
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
  const { mechanism } = await requireRole(args, args.params.id, "viewer");
  const format = new URL(args.request.url).searchParams.get("format") ?? "";
  if (!Object.hasOwn(formats, format)) return httpError(400, "Ask for format=sbml, latex or csv.");
  const parsed = parseMechanism(mechanism.source);
  const error = parsed.diagnostics.find((d) => d.severity === "error");
  if (error) return httpError(400, `Fix the mechanism before exporting it: line ${error.line}: ${error.message}`);
  const chosen = formats[format as keyof typeof formats];
  let body: string;
  if (format === "sbml") {
    body = exportSbml(parsed.mechanism, { title: mechanism.title });
  } else {
    const report = await analysisFor(args.context, mechanism.source);
    const refusal = format === "csv" ? csvTooLarge(report) : null;
    if (refusal) return httpError(413, refusal);
    body = format === "latex" ? exportLatex(parsed.mechanism, report, { title: mechanism.title }) : stoichiometricMatrixCsv(report);
  }
  const filename = `${mechanism.title.replace(/[^\w.-]+/g, "-").replace(/^-|-$/g, "") || mechanism.id}.${chosen.extension}`;
  return new Response(body, { headers: { "Content-Type": chosen.type, "Content-Disposition": `attachment; filename="${filename}"` } });
}
