import { Form, Link, redirect, useNavigation } from "react-router";
import { deleteMechanism, renameMechanism } from "../../server/db/mechanisms";
import { atLeast } from "../../server/db/roles";
import { RolePill } from "~/components/role-pill";
import { titleField } from "~/utils/fields";
import { timeAgo } from "~/utils/format";
import { httpError, requireRole, requireViewAccess } from "~/utils/permissions.server";
import type { Route } from "./+types/mechanism";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.mechanism.title ?? "Mechanism"} · Mechweave` }];

export async function loader(args: Route.LoaderArgs) {
  const { mechanism, role } = await requireViewAccess(args, args.params.id);
  return {
    role,
    mechanism: { id: mechanism.id, title: mechanism.title, summary: mechanism.summary, source: mechanism.source, updatedAt: mechanism.updatedAt.toISOString() },
  };
}

export async function action(args: Route.ActionArgs) {
  const form = await args.request.formData();
  const intent = form.get("intent");
  if (intent === "rename") {
    const { mechanism } = await requireRole(args, args.params.id, "editor");
    const title = titleField.safeParse(form.get("title"));
    if (!title.success) return Response.json({ error: title.error.issues[0].message }, { status: 400 });
    await renameMechanism(args.context.db, mechanism.id, title.data);
    return { ok: "Renamed." };
  }
  if (intent === "delete") {
    const { mechanism, user } = await requireRole(args, args.params.id, "owner");
    await deleteMechanism(args.context.db, user.id, mechanism.id);
    throw redirect("/dashboard");
  }
  throw httpError(400, "Unknown action.");
}

export default function MechanismPage({ loaderData, actionData }: Route.ComponentProps) {
  const { mechanism, role } = loaderData;
  const canEdit = atLeast(role, "editor");
  const busy = useNavigation().state === "submitting";
  const result = actionData as { error?: string; ok?: string } | undefined;
  return (
    <main className="mx-auto max-w-7xl px-6 py-8">
      <div className="flex flex-wrap items-start justify-between gap-4">
        <div className="min-w-0">
          <p className="text-xs text-muted"><Link to="/dashboard">Mechanisms</Link> / {mechanism.id}</p>
          <h1 className="mt-1 truncate" data-testid="mechanism-title">{mechanism.title}</h1>
          {mechanism.summary && <p className="mt-1 max-w-2xl text-sm text-muted">{mechanism.summary}</p>}
          <p className="mt-2 flex items-center gap-2 text-xs text-muted">
            <RolePill role={role} /> changed {timeAgo(mechanism.updatedAt)}
          </p>
        </div>
        <nav className="flex gap-2">
          <Link to={`/m/${mechanism.id}/members`} className="btn">Members</Link>
        </nav>
      </div>

      <section className="mt-6 grid gap-6 lg:grid-cols-[minmax(0,1fr)_20rem]">
        <div className="card overflow-hidden">
          <div className="flex items-center justify-between border-b border-line px-4 py-2 text-xs text-muted">
            <span>Mechanism text</span>
            <span>{canEdit ? "read-only for now" : "read-only"}</span>
          </div>
          <pre className="overflow-x-auto p-4 text-sm leading-relaxed" data-testid="source">{mechanism.source || "(empty)"}</pre>
        </div>
        <aside className="space-y-4">
          {canEdit && (
            <Form method="post" className="card space-y-2 p-4">
              <h3>Title</h3>
              <input type="hidden" name="intent" value="rename" />
              <input className="field" name="title" defaultValue={mechanism.title} aria-label="Title" required maxLength={200} />
              <button className="btn" type="submit" disabled={busy}>Rename</button>
              {result?.error && <p className="text-xs text-danger">{result.error}</p>}
              {result?.ok && <p className="text-xs text-ok">{result.ok}</p>}
            </Form>
          )}
          {role === "owner" && (
            <Form
              method="post"
              className="card space-y-2 p-4"
              onSubmit={(e) => {
                if (!confirm(`Delete “${mechanism.title}” for every member? This cannot be undone.`)) e.preventDefault();
              }}
            >
              <h3>Danger zone</h3>
              <input type="hidden" name="intent" value="delete" />
              <button className="btn btn-danger" type="submit">Delete mechanism</button>
            </Form>
          )}
        </aside>
      </section>
    </main>
  );
}
