// Sessions live in PostgreSQL; the browser holds only a signed, httpOnly, SameSite=Lax id.
import { randomBytes } from "node:crypto";
import { eq } from "drizzle-orm";
import { createCookie, createSessionStorage, type SessionStorage } from "react-router";
import type { Db } from "../db/client";
import { sessions } from "../db/schema";

export interface SessionData {
  userId: string;
  /** View-link tokens this browser has opened; they grant viewer access while live. */
  viewTokens: string[];
}

export type SessionStore = SessionStorage<SessionData>;

const MAX_AGE_SECONDS = 60 * 60 * 24 * 30;

/** The session id's cookie: `secrets[0]` signs, every one verifies, so rotating keeps old sessions alive. */
export function sessionCookie(secrets: string[], secure: boolean) {
  return createCookie("mw_session", { httpOnly: true, sameSite: "lax", path: "/", secure, secrets, maxAge: MAX_AGE_SECONDS });
}

export function createSessionStore(db: Db, secrets: string[], secure: boolean): SessionStore {
  const cookie = sessionCookie(secrets, secure);
  const expiry = (expires?: Date) => expires ?? new Date(Date.now() + MAX_AGE_SECONDS * 1000);
  return createSessionStorage<SessionData>({
    cookie,
    async createData(data, expires) {
      const id = randomBytes(24).toString("base64url");
      await db.insert(sessions).values({ id, userId: data.userId ?? null, data, expiresAt: expiry(expires) });
      return id;
    },
    async readData(id) {
      const row = await db.query.sessions.findFirst({ where: eq(sessions.id, id) });
      if (!row || row.expiresAt < new Date()) return null;
      return row.data as Partial<SessionData>;
    },
    async updateData(id, data, expires) {
      await db.update(sessions).set({ data, userId: data.userId ?? null, expiresAt: expiry(expires) }).where(eq(sessions.id, id));
    },
    async deleteData(id) {
      await db.delete(sessions).where(eq(sessions.id, id));
    },
  });
}
