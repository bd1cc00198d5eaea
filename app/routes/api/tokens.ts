import { z } from "zod";
import { createApiToken, listApiTokens } from "~/utils/accounts.server";
import { requireSessionUser } from "~/utils/auth.server";
import { tokenNameField } from "~/shared/fields";
import { methodNotAllowed } from "~/utils/http";
import { readJson } from "~/utils/json.server";
import type { Route } from "./+types/tokens";

export async function loader(args: Route.LoaderArgs) {
  const user = await requireSessionUser(args);
  return Response.json({ tokens: await listApiTokens(args.context.db, user.id) });
}

export async function action(args: Route.ActionArgs) {
  if (args.request.method !== "POST") return methodNotAllowed(["GET", "POST"], "Use POST to create a token.");
  const user = await requireSessionUser(args);
  const { name } = await readJson(args.request, z.object({ name: tokenNameField }));
  const created = await createApiToken(args.context.db, user.id, name);
  return Response.json({ id: created.id, name: created.name, token: created.token }, { status: 201 });
}
