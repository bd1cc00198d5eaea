// Failed sign-ins are counted per client address and per account over a sliding window, in the
// database so the limit holds across restarts and server processes.
import { and, count, eq, gt, lt } from "drizzle-orm";
import type { Db } from "../db/client";
import { failedSignIns } from "../db/schema";

const WINDOW_MS = 15 * 60 * 1000;
export const MAX_FAILURES_PER_ADDRESS = 30;
export const MAX_FAILURES_PER_ACCOUNT = 8;

export async function signInBlocked(db: Db, address: string, email: string): Promise<boolean> {
  const since = new Date(Date.now() - WINDOW_MS);
  const [[byAddress], [byAccount]] = await Promise.all([
    db.select({ n: count() }).from(failedSignIns).where(and(eq(failedSignIns.address, address), gt(failedSignIns.at, since))),
    db.select({ n: count() }).from(failedSignIns).where(and(eq(failedSignIns.email, email), gt(failedSignIns.at, since))),
  ]);
  return byAddress.n >= MAX_FAILURES_PER_ADDRESS || byAccount.n >= MAX_FAILURES_PER_ACCOUNT;
}

export async function recordFailedSignIn(db: Db, address: string, email: string) {
  await db.insert(failedSignIns).values({ address, email });
  await db.delete(failedSignIns).where(lt(failedSignIns.at, new Date(Date.now() - WINDOW_MS)));
}

export async function clearFailedSignIns(db: Db, email: string) {
  await db.delete(failedSignIns).where(eq(failedSignIns.email, email));
}
