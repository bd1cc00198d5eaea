import { endUserSession } from "~/utils/auth.server";
import type { Route } from "./+types/sign-out";

export async function action(args: Route.ActionArgs) {
  return endUserSession(args);
}

/** Only a form post signs out: a link or an image on another site must not be able to. */
export function loader() {
  return new Response("Sign out with the Sign out button at the top of any page.", { status: 405, headers: { Allow: "POST", "Content-Type": "text/plain; charset=utf-8" } });
}
