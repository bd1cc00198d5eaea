import { endUserSession } from "~/utils/auth.server";
import type { Route } from "./+types/sign-out";

export async function action(args: Route.ActionArgs) {
  return endUserSession(args);
}

export async function loader(args: Route.LoaderArgs) {
  return endUserSession(args);
}
