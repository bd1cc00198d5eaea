import { z } from "zod";
import { isMembershipError } from "~/utils/mechanisms.server";
import { memberRoleField } from "~/shared/fields";
import { httpError, methodNotAllowed, onlyMethods } from "~/utils/http";
import { readJson } from "~/utils/json.server";
import { requireRole } from "~/utils/permissions.server";
import { inviteByEmail } from "~/utils/sharing.server";
import type { Route } from "./+types/invitations";

const body = z.object({ email: z.string().trim().toLowerCase().email("Enter a valid e-mail address."), role: memberRoleField });

const allowed = ["POST"];
const hint = "Use POST to invite.";
export const loader = onlyMethods(allowed, hint);

export async function action(args: Route.ActionArgs) {
  if (args.request.method !== "POST") return methodNotAllowed(allowed, hint);
  const { mechanism, user } = await requireRole(args, args.params.id, "owner");
  const input = await readJson(args.request, body);
  try {
    const invitation = await inviteByEmail(args.context, args.request, user, mechanism, input.email, input.role);
    return Response.json({ id: invitation.id, email: invitation.email, role: invitation.role, expiresAt: invitation.expiresAt }, { status: 201 });
  } catch (error) {
    if (isMembershipError(error)) return httpError("bad_input", error.message);
    throw error;
  }
}
