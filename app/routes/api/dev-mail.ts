import { onlyMethods } from "~/utils/http";
import { requireCaughtMail } from "~/utils/mailbox.server";
import type { Route } from "./+types/dev-mail";

export const action = onlyMethods(["GET"]);

/** Only with the local mail catcher, and only for the demo owner: every caught message, newest first. */
export async function loader(args: Route.LoaderArgs) {
  const messages = await requireCaughtMail(args);
  return Response.json({ messages: messages.map(({ to, subject, text, html, at }) => ({ to: to.join(", "), subject, text, html, at })) });
}
