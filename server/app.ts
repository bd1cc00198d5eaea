// The Express app: the door every request passes (frame protection, refusing cross-site
// writes), static files, fonts, the React Router request handler, and 503 while the database is
// away. The caller owns the http.Server (so the collaboration WebSocket can share its port).
import { createRequestHandler } from "@react-router/express";
import express from "express";
import path from "node:path";
import type { AppLoadContext, ServerBuild } from "react-router";
import { errorBody, statusOf } from "../app/shared/error-codes";
import type { AppServices } from "./context";
import { isDatabaseUnavailable } from "./db/unavailable";
import { isOwnOrigin } from "./origin";

export interface AppOptions {
  projectRoot: string;
  services: AppServices;
  /** Vite dev server in middleware mode; absent in production. */
  vite?: import("vite").ViteDevServer;
  /** Express's "trust proxy": which proxies may speak for the client in X-Forwarded-For. */
  trustProxy: boolean | number | string;
}

export async function createApp({ projectRoot, services, vite, trustProxy }: AppOptions) {
  const app = express();
  app.disable("x-powered-by");
  // The client address behind sign-in limits comes from X-Forwarded-For only through proxies the
  // operator names; anyone can write that header.
  app.set("trust proxy", trustProxy);
  app.use(door(services.publicOrigin));
  app.use("/fonts", express.static(path.join(projectRoot, "fonts"), { immutable: true, maxAge: "1y" }));

  const getLoadContext = (req: express.Request): AppLoadContext => ({
    ...services,
    clientAddress: req.ip ?? req.socket.remoteAddress ?? "unknown",
  });

  if (vite) {
    app.use(vite.middlewares);
    app.use(async (req, res, next) => {
      try {
        const build = (await vite.ssrLoadModule("virtual:react-router/server-build")) as ServerBuild;
        return createRequestHandler({ build, getLoadContext, mode: "development" })(req, res, next);
      } catch (error) {
        next(error);
      }
    });
  } else {
    const client = path.join(projectRoot, "build", "client");
    app.use("/assets", express.static(path.join(client, "assets"), { immutable: true, maxAge: "1y" }));
    app.use(express.static(client, { maxAge: "1h", index: false }));
    const build = (await import(path.join(projectRoot, "build", "server", "index.js"))) as ServerBuild;
    app.all("/{*splat}", createRequestHandler({ build, getLoadContext, mode: "production" }));
  }
  app.use(unavailable);
  return app;
}

const stateChanging = new Set(["POST", "PUT", "PATCH", "DELETE"]);
const served = new Set(["GET", "HEAD", ...stateChanging]);
const allow = [...served].join(", ");

/**
 * Headers for every response, and the cross-site check: a browser names the page a request
 * comes from in `Origin`, so a write from another site's page is refused before it reaches a
 * route. Scripts send no Origin and keep working, with a bearer token or a session.
 */
function door(publicOrigin: string | null) {
  return (req: express.Request, res: express.Response, next: express.NextFunction) => {
    res.set({ "X-Frame-Options": "DENY", "X-Content-Type-Options": "nosniff" });
    // The router would run a page's loader for any other method; we answer them here. OPTIONS gets
    // no CORS headers, so another site's preflight fails, as the same-site policy wants.
    if (!served.has(req.method)) {
      res.set("Allow", allow);
      if (req.method === "OPTIONS") return res.status(204).end();
      return res.status(statusOf("method_not_allowed")).json(errorBody("method_not_allowed", `${req.method} is not served here.`));
    }
    const origin = req.get("Origin");
    if (stateChanging.has(req.method) && origin !== undefined && !isOwnOrigin(origin, req.get("Host"), publicOrigin)) {
      const message = "Requests from other sites cannot change anything here.";
      res.status(statusOf("forbidden"));
      if (req.path.startsWith("/api/")) return res.json(errorBody("forbidden", message));
      return res.type("text/plain").send(message);
    }
    next();
  };
}

/** The database being away is not a bug: 503 as /healthz says, JSON under /api/, a plain page elsewhere. */
function unavailable(error: unknown, req: express.Request, res: express.Response, next: express.NextFunction) {
  if (!isDatabaseUnavailable(error) || res.headersSent) return next(error);
  console.error(`[http] ${req.method} ${req.path}: database unavailable (${(error as Error).message})`);
  res.status(statusOf("unavailable")).set("Retry-After", "30");
  if (req.path.startsWith("/api/")) return res.json(errorBody("unavailable", "The database is unavailable just now; try again shortly."));
  res
    .set("Content-Security-Policy", "default-src 'none'; frame-ancestors 'none'")
    .type("html")
    .send(
      `<!doctype html><html lang="en"><meta charset="utf-8"><title>Temporarily unavailable · Mechweave</title>` +
        `<h1>Mechweave is temporarily unavailable</h1><p>The database cannot be reached just now. Your saved work is safe; try again in a minute.</p></html>`,
    );
}
