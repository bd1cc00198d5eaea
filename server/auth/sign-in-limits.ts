// Failed sign-ins slow down guessing without letting a stranger lock anyone out: they are counted
// per (account, client address), so failures from elsewhere never delay the owner at their own
// address, and after a few free tries each further one doubles the wait. A cap per address stops
// one address from trying many accounts. Kept in the database so it holds across restarts and
// server processes; the address is the socket's unless TRUST_PROXY names the proxies to believe.
import { and, count, eq, gt, lt, max, min } from "drizzle-orm";
import type { Db } from "../db/client";
import { failedSignIns } from "../db/schema";

const WINDOW_MS = 15 * 60 * 1000;
export const FREE_FAILURES = 5;
const FIRST_DELAY_MS = 1000;
export const MAX_FAILURES_PER_ADDRESS = 30;

/** Milliseconds this address must wait before trying this account again; 0 when it may try now. */
export async function signInWait(db: Db, address: string, email: string, now = Date.now()): Promise<number> {
  const since = new Date(now - WINDOW_MS);
  const [[pair], [byAddress]] = await Promise.all([
    db
      .select({ n: count(), last: max(failedSignIns.at) })
      .from(failedSignIns)
      .where(and(eq(failedSignIns.email, email), eq(failedSignIns.address, address), gt(failedSignIns.at, since))),
    db.select({ n: count(), first: min(failedSignIns.at) }).from(failedSignIns).where(and(eq(failedSignIns.address, address), gt(failedSignIns.at, since))),
  ]);
  let wait = 0;
  if (pair.n >= FREE_FAILURES && pair.last) {
    const delay = Math.min(FIRST_DELAY_MS * 2 ** (pair.n - FREE_FAILURES), WINDOW_MS);
    wait = new Date(pair.last).getTime() + delay - now;
  }
  if (byAddress.n >= MAX_FAILURES_PER_ADDRESS && byAddress.first) {
    wait = Math.max(wait, new Date(byAddress.first).getTime() + WINDOW_MS - now);
  }
  return Math.max(0, wait);
}

export async function recordFailedSignIn(db: Db, address: string, email: string) {
  await db.insert(failedSignIns).values({ address, email });
  await db.delete(failedSignIns).where(lt(failedSignIns.at, new Date(Date.now() - WINDOW_MS)));
}

/** A right password from this address forgives this address's failures on this account only. */
export async function clearFailedSignIns(db: Db, address: string, email: string) {
  await db.delete(failedSignIns).where(and(eq(failedSignIns.email, email), eq(failedSignIns.address, address)));
}
