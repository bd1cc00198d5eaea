// What every loader and action receives as `context`: the process's long-lived services.
// Route modules import only types from server/; the instances come from here.
import type { Authenticator } from "remix-auth";
import type { AuthUser } from "./auth/authenticator";
import type { SessionStore } from "./auth/sessions";
import type { Db } from "./db/client";

export interface AppServices {
  db: Db;
  sessions: SessionStore;
  authenticator: Authenticator<AuthUser>;
  /** True when the local mail catcher and the demo helpers are available. */
  development: boolean;
}

export interface RequestContext extends AppServices {
  /** The client's network address, for sign-in limits. */
  clientAddress: string;
}

declare module "react-router" {
  interface AppLoadContext extends RequestContext {}
}
