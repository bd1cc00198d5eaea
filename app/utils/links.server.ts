// Where links that leave the page (e-mails, view links) point.
import type { AppLoadContext } from "react-router";

/**
 * The public origin of links: PUBLIC_URL when the operator set it, else the origin the request
 * came in on. Behind a proxy the Host header is whatever the client wrote, so an invitation or
 * reset link built from it could point at someone else's site; PUBLIC_URL closes that.
 */
export function publicOrigin(context: AppLoadContext, request: Request): string {
  return context.publicOrigin ?? new URL(request.url).origin;
}
