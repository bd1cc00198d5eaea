// Opening a view link remembers its token in this browser's session, then shows the mechanism.
import { redirect } from "react-router";
import { httpError } from "~/utils/http";
import { viewLinkMechanism } from "~/utils/sharing.server";
import type { Route } from "./+types/view-link";

const MAX_REMEMBERED_LINKS = 20;

export async function loader({ request, context, params }: Route.LoaderArgs) {
  const mechanismId = await viewLinkMechanism(context, params.token);
  if (!mechanismId) {
    throw httpError("not_found", "This view link is not valid: it may have expired or been revoked by the owner.");
  }
  const session = await context.sessions.getSession(request.headers.get("Cookie"));
  const tokens = [params.token, ...(session.get("viewTokens") ?? []).filter((t) => t !== params.token)];
  session.set("viewTokens", tokens.slice(0, MAX_REMEMBERED_LINKS));
  throw redirect(`/m/${mechanismId}`, { headers: { "Set-Cookie": await context.sessions.commitSession(session) } });
}
