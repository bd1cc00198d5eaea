import { Form, Link } from "react-router";
import { z } from "zod";
import { createApiToken, listApiTokens, revokeApiToken } from "~/utils/accounts.server";
import { requireSessionUser } from "~/utils/auth.server";
import { tokenNameField } from "~/shared/fields";
import { TimeAgo } from "~/components/time-ago";
import type { Route } from "./+types/tokens";
import { httpError } from "~/utils/http";

export const meta: Route.MetaFunction = () => [{ title: "Access tokens · Mechweave" }];

export async function loader(args: Route.LoaderArgs) {
  const user = await requireSessionUser(args);
  const tokens = await listApiTokens(args.context.db, user.id);
  return { tokens: tokens.map((t) => ({ ...t, createdAt: t.createdAt.toISOString(), lastUsedAt: t.lastUsedAt?.toISOString() ?? null })) };
}

const tokenActions = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("create"), name: tokenNameField }),
  z.object({ intent: z.literal("revoke"), tokenId: z.string().uuid() }),
]);

export async function action(args: Route.ActionArgs) {
  const user = await requireSessionUser(args);
  const parsed = tokenActions.safeParse(Object.fromEntries(await args.request.formData()));
  if (!parsed.success) return httpError("bad_input", parsed.error.issues[0].message);
  if (parsed.data.intent === "create") {
    const created = await createApiToken(args.context.db, user.id, parsed.data.name);
    return { created: created.token, name: created.name };
  }
  await revokeApiToken(args.context.db, user.id, parsed.data.tokenId);
  return { revoked: true };
}

export default function Tokens({ loaderData, actionData }: Route.ComponentProps) {
  const result = actionData as { created?: string; name?: string; error?: string } | undefined;
  return (
    <main className="mx-auto max-w-4xl px-6 py-8">
      <h1>Personal access tokens</h1>
      <p className="mt-1 max-w-2xl text-sm text-muted">
        A token lets a script call the <Link to="/api">JSON API</Link> as you, with your roles. It is shown once; Mechweave keeps only a hash.
        Revoke a token the moment it may have leaked.
      </p>
      <Form method="post" className="card mt-6 flex items-end gap-3 p-4">
        <input type="hidden" name="intent" value="create" />
        <div className="flex-1">
          <label className="label" htmlFor="token-name">Name</label>
          <input className="field" id="token-name" name="name" placeholder="e.g. nightly fitting script" required maxLength={80} />
        </div>
        <button className="btn btn-primary" type="submit">Create token</button>
      </Form>
      {result?.error && <p className="notice-error mt-4">{result.error}</p>}
      {result?.created && (
        <div className="notice-ok mt-4">
          <p>Token “{result.name}” — copy it now, it will not be shown again:</p>
          <code className="mt-1 block break-all" data-testid="new-token">{result.created}</code>
        </div>
      )}
      <div className="card mt-6 overflow-hidden">
        <table className="w-full text-sm">
          <thead className="bg-canvas/60 text-left text-xs uppercase tracking-wider text-muted">
            <tr><th className="px-4 py-2.5 font-medium">Name</th><th className="px-4 py-2.5 font-medium">Created</th><th className="px-4 py-2.5 font-medium">Last used</th><th /></tr>
          </thead>
          <tbody>
            {loaderData.tokens.map((t) => (
              <tr key={t.id} className="border-t border-line">
                <td className="px-4 py-3"><span className="font-medium">{t.name}</span> <code className="text-xs text-muted">…{t.hint}</code></td>
                <td className="px-4 py-3 text-muted"><TimeAgo at={t.createdAt} /></td>
                <td className="px-4 py-3 text-muted">{t.lastUsedAt ? <TimeAgo at={t.lastUsedAt} /> : "never"}</td>
                <td className="px-4 py-3 text-right">
                  <Form method="post">
                    <input type="hidden" name="intent" value="revoke" />
                    <input type="hidden" name="tokenId" value={t.id} />
                    <button className="btn btn-danger" type="submit">Revoke</button>
                  </Form>
                </td>
              </tr>
            ))}
            {loaderData.tokens.length === 0 && <tr><td colSpan={4} className="px-4 py-6 text-center text-muted">No tokens yet.</td></tr>}
          </tbody>
        </table>
      </div>
    </main>
  );
}
