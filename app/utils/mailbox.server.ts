// Who may read the local mail catcher: only the demo owner, signed in through the browser session
// with its seeded, verified address. Mail carries invitation, confirmation and reset links.
import type { CaughtMessage } from "../../server/mail/catcher";
import { demoAccounts } from "../../server/seed/demo";
import { getCaller, signInRequired, type RequestArgs } from "./auth.server";
import { httpError } from "./http";

/** Every caught message, newest first; signed out: sign in (401 under /api/), anyone else: 404. */
export async function requireCaughtMail(args: RequestArgs): Promise<CaughtMessage[]> {
  const caller = await getCaller(args);
  if (!caller.user) throw signInRequired(args.request);
  const reader = caller.via === "session" && caller.user.verified && caller.user.email === demoAccounts[0].email;
  if (!args.context.mailCatcher || !reader) throw httpError("not_found", "There is no mailbox here.");
  return args.context.mailCatcher.messages();
}
