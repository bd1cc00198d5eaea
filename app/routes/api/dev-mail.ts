import { httpError, onlyMethods } from "~/utils/http";
import type { Route } from "./+types/dev-mail";

export const action = onlyMethods(["GET"]);

/** Only with the local mail catcher: every caught message, newest first. */
export async function loader({ context }: Route.LoaderArgs) {
  if (!context.mailCatcher) return httpError(404, "No local mail catcher: this server sends mail through SMTP_URL.");
  return Response.json({ messages: context.mailCatcher.messages().map(({ to, subject, text, html, at }) => ({ to: to.join(", "), subject, text, html, at })) });
}
