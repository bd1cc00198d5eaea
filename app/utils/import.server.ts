// A new mechanism from an SBML file, for the API and the dashboard alike. Nothing is created from
// a file that fails; the translation's warnings are kept in the summary.
import type { AppLoadContext } from "react-router";
import type { AuthUser } from "../../server/auth/authenticator";
import { createMechanism } from "../../server/db/mechanisms";
import { sbmlImportFor } from "./analysis.server";
import { jobOwner } from "./dynamics.server";
import { byteSize, MAX_SBML_BYTES, MAX_SUMMARY_CHARS, MAX_TITLE_CHARS } from "~/chem/limits";
import { controlCharacterProblem } from "~/shared/fields";
import { httpError } from "./http";

export const oversizedSbmlMessage = `The file is over ${byteSize(MAX_SBML_BYTES)}.`;

export async function importSbmlFile({ request, context }: { request: Request; context: AppLoadContext }, user: AuthUser, xml: string, filename: string | null) {
  if (Buffer.byteLength(xml) > MAX_SBML_BYTES) throw httpError("too_large", oversizedSbmlMessage);
  if (!xml.trim()) throw httpError("bad_input", "The file is empty.");
  refuseControlCharacters("The file", xml);
  // Reading XML and translating it is heavy for a large file: a worker does it.
  const imported = await sbmlImportFor({ request, context, owner: jobOwner(context, user) }, xml);
  if ("errors" in imported) throw httpError("bad_input", `This is not an SBML file Mechweave can read: ${imported.errors.join(" ")}`);
  const title = (imported.title || filename?.replace(/\.(xml|sbml)$/i, "") || "Imported model").slice(0, MAX_TITLE_CHARS);
  // Character references (`&#1;`) and the upload's file name reach the text past the raw check.
  refuseControlCharacters("The model's name", title);
  refuseControlCharacters("The translated mechanism", imported.source);
  const summary = imported.warnings.length ? `Imported from SBML with notes: ${imported.warnings.join(" ")}` : "Imported from SBML.";
  const row = await createMechanism(context.db, user.id, { title, source: imported.source, summary: summary.slice(0, MAX_SUMMARY_CHARS) });
  return { row, warnings: imported.warnings };
}

function refuseControlCharacters(what: string, text: string) {
  const problem = controlCharacterProblem(text);
  if (problem) throw httpError("bad_input", `${what} ${problem}`);
}
