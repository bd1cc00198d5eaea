// Failed sign-ins slow down guessing without letting a stranger lock anyone out: they are counted
// per (account, client address), so failures from elsewhere never delay the owner at their own
// address, and after a few free tries each further one doubles the wait. A cap per address stops
// one address from trying many accounts. Kept in the database so it holds across restarts and
// server processes; the address is the socket's unless TRUST_PROXY names the proxies to believe.
import { and, count, eq, gt, lt, max, min } from "drizzle-orm";
import type { Db } from "../db/client";
import { failedSignIns } from "../db/schema";

export interface SignInLimitSettings {
  /** How long a failure counts. */
  windowMs: number;
  /** Failures per (account, address) before each further one doubles the wait. */
  freeFailures: number;
  /** The wait after the first failure beyond the free ones. */
  firstDelayMs: number;
  /** Failures per address, any account, before the address waits out the window. */
  failuresPerAddress: number;
}

export const defaultSignInLimits: SignInLimitSettings = {
  windowMs: 15 * 60 * 1000,
  freeFailures: 5,
  firstDelayMs: 1000,
  failuresPerAddress: 30,
};

export type SignInLimits = ReturnType<typeof signInLimits>;

export function signInLimits(db: Db, settings: Partial<SignInLimitSettings> = {}) {
  const { windowMs, freeFailures, firstDelayMs, failuresPerAddress } = { ...defaultSignInLimits, ...settings };
  return {
    /** Milliseconds this address must wait before trying this account again; 0 when it may try now. */
    async wait(address: string, email: string, now = Date.now()): Promise<number> {
      const since = new Date(now - windowMs);
      const [[pair], [byAddress]] = await Promise.all([
        db
          .select({ n: count(), last: max(failedSignIns.at) })
          .from(failedSignIns)
          .where(and(eq(failedSignIns.email, email), eq(failedSignIns.address, address), gt(failedSignIns.at, since))),
        db.select({ n: count(), first: min(failedSignIns.at) }).from(failedSignIns).where(and(eq(failedSignIns.address, address), gt(failedSignIns.at, since))),
      ]);
      let wait = 0;
      if (pair.n >= freeFailures && pair.last) {
        const delay = Math.min(firstDelayMs * 2 ** (pair.n - freeFailures), windowMs);
        wait = new Date(pair.last).getTime() + delay - now;
      }
      if (byAddress.n >= failuresPerAddress && byAddress.first) {
        wait = Math.max(wait, new Date(byAddress.first).getTime() + windowMs - now);
      }
      return Math.max(0, wait);
    },

    async recordFailure(address: string, email: string) {
      await db.insert(failedSignIns).values({ address, email });
      await db.delete(failedSignIns).where(lt(failedSignIns.at, new Date(Date.now() - windowMs)));
    },

    /** A right password from this address forgives this address's failures on this account only. */
    async clear(address: string, email: string) {
      await db.delete(failedSignIns).where(and(eq(failedSignIns.email, email), eq(failedSignIns.address, address)));
    },
  };
}
