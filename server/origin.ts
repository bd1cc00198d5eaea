// Which Origin header names this site, for the HTTP door (server/app.ts) and the collaboration
// WebSocket alike. This site is the host the request was sent to, or PUBLIC_URL when set (behind
// a proxy that rewrites Host, the browser's origin is the public one).

/**
 * A browser's Origin header against the request's own Host. The scheme is not compared: only a
 * page served by this very host can make a browser send it, and TLS is the proxy's business.
 * `null` (sandboxed frames, cross-site redirects) is never this site. `publicOrigin` is PUBLIC_URL's
 * origin (null when unset), compared whole.
 */
export function isOwnOrigin(origin: string, host: string | undefined, publicOrigin: string | null): boolean {
  const url = URL.parse(origin);
  if (!url || origin === "null") return false;
  return url.host === host || url.origin === publicOrigin;
}
