import { useMemo, useState } from "react";
import { Form, Link, redirect, useNavigation } from "react-router";
import { createMechanism, listMechanismsFor } from "~/utils/mechanisms.server";
import { RolePill } from "~/components/role-pill";
import { requireUser } from "~/utils/auth.server";
import { titleField } from "~/shared/fields";
import { importSbmlFile } from "~/utils/import.server";
import { TimeAgo } from "~/components/time-ago";
import type { Route } from "./+types/dashboard";
import { httpError } from "~/utils/http";

export const meta: Route.MetaFunction = () => [{ title: "Mechanisms · Mechweave" }];

export async function loader(args: Route.LoaderArgs) {
  const user = await requireUser(args);
  const mechanisms = await listMechanismsFor(args.context.db, user.id);
  return { mechanisms: mechanisms.map((m) => ({ ...m, updatedAt: m.updatedAt.toISOString() })) };
}

export async function action(args: Route.ActionArgs) {
  const user = await requireUser(args);
  const form = await args.request.formData();
  if (form.get("intent") === "import") {
    const file = form.get("file");
    if (!(file instanceof File) || file.size === 0) return httpError("bad_input", "Choose an SBML file to import.");
    try {
      const { row } = await importSbmlFile(args, user, await file.text(), file.name);
      throw redirect(`/m/${row.id}`);
    } catch (error) {
      if (error instanceof Response && error.status >= 400) return Response.json(await error.json(), { status: error.status });
      throw error;
    }
  }
  const title = titleField.safeParse(form.get("title"));
  if (!title.success) return httpError("bad_input", title.error.issues[0].message);
  const row = await createMechanism(args.context.db, user.id, { title: title.data, source: "# Write one reaction step a line, e.g.\n# A + B -> C @ k1 = 0.5\n" });
  throw redirect(`/m/${row.id}`);
}

type SortKey = "title" | "role" | "owner" | "updatedAt";
const columns: [SortKey, string][] = [["title", "Title"], ["role", "Your role"], ["owner", "Owner"], ["updatedAt", "Last change"]];

export default function Dashboard({ loaderData, actionData }: Route.ComponentProps) {
  const [filter, setFilter] = useState("");
  const [sort, setSort] = useState<{ key: SortKey; descending: boolean }>({ key: "updatedAt", descending: true });
  const busy = useNavigation().state === "submitting";
  const rows = useMemo(() => {
    const needle = filter.trim().toLowerCase();
    const visible = loaderData.mechanisms.filter((m) => !needle || `${m.title} ${m.owner} ${m.role}`.toLowerCase().includes(needle));
    return visible.sort((a, b) => {
      const order = a[sort.key].localeCompare(b[sort.key]);
      return sort.descending ? -order : order;
    });
  }, [loaderData.mechanisms, filter, sort]);
  const failed = actionData as { error?: string } | undefined;

  return (
    <main className="mx-auto max-w-7xl px-6 py-10">
      <div className="flex flex-wrap items-end justify-between gap-4">
        <div>
          <h1>Mechanisms</h1>
          <p className="mt-1 text-sm text-muted">Everything you own or were invited to, newest change first.</p>
        </div>
        <div className="flex flex-wrap items-start gap-2">
        <Form method="post" className="flex items-start gap-2">
          <div>
            <input className="field w-56 sm:w-72" name="title" placeholder="Title of a new mechanism" aria-label="Title of a new mechanism" required maxLength={200} />
            {failed?.error && <p className="mt-1 text-xs text-danger">{failed.error}</p>}
          </div>
          <button className="btn btn-primary" type="submit" disabled={busy}>New mechanism</button>
        </Form>
        <Form method="post" encType="multipart/form-data" className="flex items-center gap-2">
          <input type="hidden" name="intent" value="import" />
          <label className="btn">
            Import SBML…
            <input type="file" name="file" accept=".xml,.sbml" className="sr-only" onChange={(e) => e.currentTarget.form?.requestSubmit()} />
          </label>
        </Form>
        </div>
      </div>

      <div className="card mt-8 overflow-hidden">
        <div className="flex items-center gap-3 border-b border-line px-4 py-3">
          <input
            className="field max-w-xs py-1.5"
            type="search"
            placeholder="Filter by title, owner or role"
            aria-label="Filter mechanisms"
            value={filter}
            onChange={(e) => setFilter(e.target.value)}
          />
          <span className="text-sm text-muted">{rows.length} of {loaderData.mechanisms.length}</span>
        </div>
        <table className="w-full text-sm">
          <thead className="bg-canvas/60 text-left text-xs uppercase tracking-wider text-muted">
            <tr>
              {columns.map(([key, label]) => (
                <th key={key} className="px-4 py-2.5 font-medium" aria-sort={sort.key === key ? (sort.descending ? "descending" : "ascending") : "none"}>
                  <button
                    type="button"
                    className="inline-flex items-center gap-1 uppercase tracking-wider hover:text-ink"
                    onClick={() => setSort((s) => ({ key, descending: s.key === key ? !s.descending : key === "updatedAt" }))}
                  >
                    {label}
                    <span aria-hidden="true">{sort.key === key ? (sort.descending ? "↓" : "↑") : ""}</span>
                  </button>
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {rows.map((m) => (
              <tr key={m.id} className="border-t border-line hover:bg-accent-soft/40">
                <td className="px-4 py-3"><Link to={`/m/${m.id}`} className="font-medium">{m.title}</Link></td>
                <td className="px-4 py-3"><RolePill role={m.role} /></td>
                <td className="px-4 py-3 text-muted">{m.owner}</td>
                <td className="px-4 py-3 text-muted"><TimeAgo at={m.updatedAt} /></td>
              </tr>
            ))}
            {rows.length === 0 && (
              <tr>
                <td colSpan={4} className="px-4 py-10 text-center text-muted">
                  {loaderData.mechanisms.length === 0 ? "No mechanisms yet. Give your first one a title above." : "Nothing matches that filter."}
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>
    </main>
  );
}
