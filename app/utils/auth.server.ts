// Who is calling: a signed-in user (session cookie or API token), a view-link visitor, or nobody.
import { redirect, type AppLoadContext } from "react-router";
import type { AuthUser } from "../../server/auth/authenticator";
import { identifyCaller, type Caller } from "../../server/auth/caller";
import { httpError } from "./http";

export interface RequestArgs {
  request: Request;
  context: AppLoadContext;
}

const callers = new WeakMap<Request, Promise<Caller>>();

async function resolveCaller({ request, context }: RequestArgs): Promise<Caller> {
  const caller = await identifyCaller(context.db, context.sessions, {
    cookie: request.headers.get("Cookie"),
    authorization: request.headers.get("Authorization"),
  });
  if (caller === "bad-token") throw httpError("sign_in_required", "That access token is not valid: it was revoked or mistyped.");
  if (caller.tokenId && !context.tokenLimiter.allow(caller.tokenId)) {
    throw httpError("rate_limited", "Too many requests with this token. Wait a minute and try again.");
  }
  return caller;
}

/** Resolved once per request, however many helpers ask. */
export function getCaller(args: RequestArgs): Promise<Caller> {
  let caller = callers.get(args.request);
  if (!caller) callers.set(args.request, (caller = resolveCaller(args)));
  return caller;
}

export async function getUser(args: RequestArgs): Promise<AuthUser | null> {
  return (await getCaller(args)).user;
}

export function isApiRequest(request: Request): boolean {
  return new URL(request.url).pathname.startsWith("/api/");
}

/** What a signed-out caller gets: a redirect to sign in, or 401 JSON from the API. */
export function signInRequired(request: Request): Response {
  if (isApiRequest(request)) return httpError("sign_in_required", "Sign in first, or send Authorization: Bearer TOKEN.");
  const url = new URL(request.url);
  return redirect(`/sign-in?next=${encodeURIComponent(url.pathname + url.search)}`);
}

export async function requireUser(args: RequestArgs): Promise<AuthUser> {
  const user = await getUser(args);
  if (!user) throw signInRequired(args.request);
  return user;
}

/** A user signed in through the browser session; API tokens cannot mint tokens. */
export async function requireSessionUser(args: RequestArgs): Promise<AuthUser> {
  const caller = await getCaller(args);
  if (!caller.user) throw signInRequired(args.request);
  if (caller.via !== "session") throw httpError("forbidden", "This needs a signed-in browser session, not an access token.");
  return caller.user;
}

const SAME_SITE = "http://mechweave.invalid";

/**
 * Only paths on this site may be followed after sign-in. Browsers read a backslash as "/" and drop
 * tabs and line breaks inside a URL, so "/<backslash>evil.example" and "/<tab>/evil.example" lead
 * off-site: read the path the way a browser would, keep it only if it stays on this origin, and
 * never answer a path that a browser would read as another host ("//host").
 */
export function safeNext(next: string | null | undefined, fallback = "/dashboard"): string {
  if (!next?.startsWith("/")) return fallback;
  const url = new URL(next.replace(/[\u0000-\u001f\u007f]/g, "").replace(/\\/g, "/"), SAME_SITE);
  const path = url.pathname + url.search + url.hash;
  return url.origin === SAME_SITE && !path.startsWith("//") ? path : fallback;
}

/** For the sign-in and sign-up pages: where to go afterwards, or there at once if signed in. */
export async function redirectIfSignedIn(args: RequestArgs): Promise<{ next: string }> {
  const next = safeNext(new URL(args.request.url).searchParams.get("next"));
  if (await getUser(args)) throw redirect(next);
  return { next };
}

/**
 * Signs `user` in under a new session id and ends the old session, so an id planted in the browser
 * before sign-in (session fixation) never becomes a signed-in one. View links opened before carry over.
 */
export async function startUserSession({ request, context }: RequestArgs, user: AuthUser, redirectTo: string) {
  const previous = await context.sessions.getSession(request.headers.get("Cookie"));
  const viewTokens = previous.get("viewTokens");
  if (previous.id) await context.sessions.destroySession(previous);
  const session = await context.sessions.getSession(null);
  session.set("userId", user.id);
  if (viewTokens) session.set("viewTokens", viewTokens);
  throw redirect(redirectTo, { headers: { "Set-Cookie": await context.sessions.commitSession(session) } });
}

export async function endUserSession({ request, context }: RequestArgs) {
  const session = await context.sessions.getSession(request.headers.get("Cookie"));
  throw redirect("/", { headers: { "Set-Cookie": await context.sessions.destroySession(session) } });
}
