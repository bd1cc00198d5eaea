// The Express app: static files, fonts and the React Router request handler. The caller owns
// the http.Server (so the collaboration WebSocket can share its port).
import { createRequestHandler } from "@react-router/express";
import express from "express";
import path from "node:path";
import type { AppLoadContext, ServerBuild } from "react-router";
import type { AppServices } from "./context";

export interface AppOptions {
  projectRoot: string;
  services: AppServices;
  /** Vite dev server in middleware mode; absent in production. */
  vite?: import("vite").ViteDevServer;
}

export async function createApp({ projectRoot, services, vite }: AppOptions) {
  const app = express();
  app.disable("x-powered-by");
  app.set("trust proxy", "loopback");
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
  return app;
}
