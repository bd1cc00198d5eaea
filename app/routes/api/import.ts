// POST /api/v1/mechanisms/import: a multipart `file` field, or the raw XML as the body.
import { requireUser } from "~/utils/auth.server";
import { httpError, methodNotAllowed, onlyMethods } from "~/utils/http";
import { MAX_SBML_BYTES, MULTIPART_OVERHEAD_BYTES } from "~/chem/limits";
import { importSbmlFile, oversizedSbmlMessage } from "~/utils/import.server";
import type { Route } from "./+types/import";

async function readUpload(request: Request): Promise<{ xml: string; filename: string | null }> {
  if (Number(request.headers.get("Content-Length") ?? 0) > MAX_SBML_BYTES + MULTIPART_OVERHEAD_BYTES) throw httpError("too_large", oversizedSbmlMessage);
  if ((request.headers.get("Content-Type") ?? "").startsWith("multipart/form-data")) {
    const file = (await request.formData()).get("file");
    if (!(file instanceof File)) throw httpError("bad_input", "Send the SBML file in a form field named file.");
    return { xml: await file.text(), filename: file.name };
  }
  return { xml: await request.text(), filename: null };
}

const allowed = ["POST"];
const hint = "Use POST with an SBML file.";
export const loader = onlyMethods(allowed, hint);

export async function action(args: Route.ActionArgs) {
  if (args.request.method !== "POST") return methodNotAllowed(allowed, hint);
  const user = await requireUser(args);
  const { xml, filename } = await readUpload(args.request);
  const { row, warnings } = await importSbmlFile(args, user, xml, filename);
  return Response.json({ id: row.id, title: row.title, summary: row.summary, source: row.source, role: "owner", warnings }, { status: 201 });
}
