// What every loader and action receives as `context`: the process's long-lived services.
// Route modules import only types from server/; the instances come from here.
import type { Authenticator } from "remix-auth";
import type { AuthUser } from "./auth/authenticator";
import type { RateLimiter } from "./auth/rate-limit";
import type { SessionStore } from "./auth/sessions";
import type { SignInLimits } from "./auth/sign-in-limits";
import type { CollabHub } from "./collab/hub";
import type { Db } from "./db/client";
import type { MailCatcher } from "./mail/catcher";
import type { Mailer } from "./mail/mailer";
import type { RunJob } from "./sim/run-in-worker";

export interface AppServices {
  db: Db;
  sessions: SessionStore;
  authenticator: Authenticator<AuthUser>;
  /** Per-token request budget for the JSON API. */
  tokenLimiter: RateLimiter;
  /** Failed sign-ins per account and address, kept in the database. */
  signInLimits: SignInLimits;
  mailer: Mailer;
  /** PUBLIC_URL's origin, when set: where mailed and shared links point (see publicOrigin). */
  publicOrigin: string | null;
  /** Dynamics jobs in worker threads (loaded by the server, not bundled with the routes). */
  dynamics: { run: RunJob };
  /** The local mail catcher, when SMTP_URL is not set. */
  mailCatcher: MailCatcher | null;
  /** The live collaboration rooms: role changes, API writes to the text, versions. */
  collab: CollabHub;
  /** This process's name among the instances on the database (server/instance.ts). */
  instance: string;
}

export interface RequestContext extends AppServices {
  /** The client's network address, for sign-in limits. */
  clientAddress: string;
}

declare module "react-router" {
  interface AppLoadContext extends RequestContext {}
}
