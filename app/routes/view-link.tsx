// Opening a view link remembers its token in this browser's session, then shows the mechanism.
import { eq } from "drizzle-orm";
import { redirect } from "react-router";
import { liveViewLink } from "../../server/auth/caller";
import { hashSecret } from "../../server/auth/secrets";
import { viewLinks } from "../../server/db/schema";
import { httpError } from "~/utils/http";
import type { Route } from "./+types/view-link";

const MAX_REMEMBERED_LINKS = 20;

export async function loader({ request, context, params }: Route.LoaderArgs) {
  const [link] = await context.db.select({ mechanismId: viewLinks.mechanismId }).from(viewLinks).where(eq(viewLinks.tokenHash, hashSecret(params.token)));
  if (!link || !(await liveViewLink(context.db, link.mechanismId, [params.token]))) {
    throw httpError(404, "This view link is not valid: it may have expired or been revoked by the owner.");
  }
  const session = await context.sessions.getSession(request.headers.get("Cookie"));
  const tokens = [params.token, ...(session.get("viewTokens") ?? []).filter((t) => t !== params.token)];
  session.set("viewTokens", tokens.slice(0, MAX_REMEMBERED_LINKS));
  throw redirect(`/m/${link.mechanismId}`, { headers: { "Set-Cookie": await context.sessions.commitSession(session) } });
}
