// React Router's default Node entry, plus a Content-Security-Policy with a fresh nonce for each
// page, and the database being away answered as 503 by the Express app (server/app.ts).
import { randomBytes } from "node:crypto";
import { PassThrough } from "node:stream";
import { createReadableStreamFromReadable } from "@react-router/node";
import { isbot } from "isbot";
import type { RenderToPipeableStreamOptions } from "react-dom/server";
import { renderToPipeableStream } from "react-dom/server";
import { ServerRouter, type EntryContext, type HandleErrorFunction } from "react-router";
import { isDatabaseUnavailable } from "../server/db/unavailable";
import { NonceContext } from "./utils/nonce";

export const streamTimeout = 5_000;

/**
 * Scripts only from this site or inline with this page's nonce; styles may be inline (CodeMirror,
 * React Flow and KaTeX set them at run time); the WebSocket to /collab is 'self'; no frames, no
 * plugins, forms post only here.
 */
function contentSecurityPolicy(nonce: string): string {
  return [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}'`,
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self' data:",
    "connect-src 'self'",
    "worker-src 'self' blob:",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
  ].join("; ");
}

export default function handleRequest(request: Request, responseStatusCode: number, responseHeaders: Headers, routerContext: EntryContext) {
  const nonce = randomBytes(16).toString("base64");
  responseHeaders.set("Content-Security-Policy", contentSecurityPolicy(nonce));
  if (request.method.toUpperCase() === "HEAD") return new Response(null, { status: responseStatusCode, headers: responseHeaders });

  return new Promise<Response>((resolve, reject) => {
    let shellRendered = false;
    const userAgent = request.headers.get("user-agent");
    // Crawlers and SPA mode get the whole page at once.
    const readyOption: keyof RenderToPipeableStreamOptions = (userAgent && isbot(userAgent)) || routerContext.isSpaMode ? "onAllReady" : "onShellReady";
    let timeoutId: ReturnType<typeof setTimeout> | undefined = setTimeout(() => abort(), streamTimeout + 1000);

    const { pipe, abort } = renderToPipeableStream(
      <NonceContext.Provider value={nonce}>
        <ServerRouter context={routerContext} url={request.url} nonce={nonce} />
      </NonceContext.Provider>,
      {
        nonce,
        [readyOption]() {
          shellRendered = true;
          const body = new PassThrough({
            final(callback) {
              clearTimeout(timeoutId);
              timeoutId = undefined;
              callback();
            },
          });
          responseHeaders.set("Content-Type", "text/html");
          pipe(body);
          resolve(new Response(createReadableStreamFromReadable(body), { headers: responseHeaders, status: responseStatusCode }));
        },
        onShellError(error: unknown) {
          reject(error);
        },
        onError(error: unknown) {
          responseStatusCode = 500;
          // Errors before the shell reject and are logged by React Router itself.
          if (shellRendered) console.error(error);
        },
      },
    );
  });
}

/**
 * React Router logs an error and renders the error boundary (or a bare 500). A database that is
 * away is not a bug: rethrown, it leaves the router and reaches the Express app, which answers
 * 503 as /healthz does. (Where React Router calls this hook inside a try, its catch calls it again
 * with the same error, so the throw escapes on every path: pages, data requests, resource routes.)
 */
export const handleError: HandleErrorFunction = (error, { request }) => {
  if (isDatabaseUnavailable(error)) throw error;
  if (!request.signal.aborted) console.error(error);
};
