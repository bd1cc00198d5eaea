// Who is calling: the signed-in user behind the session cookie, if any.
import { eq } from "drizzle-orm";
import { redirect, type AppLoadContext } from "react-router";
import type { AuthUser } from "../../server/auth/authenticator";
import { users } from "../../server/db/schema";

export interface RequestArgs {
  request: Request;
  context: AppLoadContext;
}

export async function getUser({ request, context }: RequestArgs): Promise<AuthUser | null> {
  const session = await context.sessions.getSession(request.headers.get("Cookie"));
  const userId = session.get("userId");
  if (!userId) return null;
  const user = await context.db.query.users.findFirst({ where: eq(users.id, userId) });
  return user ? { id: user.id, email: user.email, name: user.name } : null;
}

export function isApiRequest(request: Request): boolean {
  return new URL(request.url).pathname.startsWith("/api/");
}

/** The signed-in user, or a redirect to the sign-in page (401 JSON for the API). */
export async function requireUser(args: RequestArgs): Promise<AuthUser> {
  const user = await getUser(args);
  if (user) return user;
  if (isApiRequest(args.request)) throw Response.json({ error: "Sign in first." }, { status: 401 });
  const url = new URL(args.request.url);
  throw redirect(`/sign-in?next=${encodeURIComponent(url.pathname + url.search)}`);
}

/** Only paths on this site may be followed after sign-in. */
export function safeNext(next: string | null | undefined, fallback = "/dashboard"): string {
  return next && next.startsWith("/") && !next.startsWith("//") ? next : fallback;
}

export async function startUserSession({ request, context }: RequestArgs, user: AuthUser, redirectTo: string) {
  const session = await context.sessions.getSession(request.headers.get("Cookie"));
  session.set("userId", user.id);
  throw redirect(redirectTo, { headers: { "Set-Cookie": await context.sessions.commitSession(session) } });
}

export async function endUserSession({ request, context }: RequestArgs) {
  const session = await context.sessions.getSession(request.headers.get("Cookie"));
  throw redirect("/", { headers: { "Set-Cookie": await context.sessions.destroySession(session) } });
}
