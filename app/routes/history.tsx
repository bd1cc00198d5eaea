// /m/:id/history — every stored version of a mechanism: compare any two (text and invariants),
// name the current one, restore an old one as a new change.
import { Form, Link, useNavigation } from "react-router";
import { z } from "zod";
import { snapshotNameField } from "~/shared/fields";
import { findSnapshot, listSnapshots, type SnapshotKind } from "~/utils/mechanisms.server";
import { atLeast } from "~/shared/roles";
import { TimeAgo } from "~/components/time-ago";
import { httpError } from "~/utils/http";
import { requireRole } from "~/utils/permissions.server";
import { describeInvariantChanges, diffText, type DiffLine } from "~/shared/version-diff";
import type { Route } from "./+types/history";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `History of ${data?.title ?? "mechanism"} · Mechweave` }];

const snapshotId = z.coerce.number().int().positive();

export async function loader(args: Route.LoaderArgs) {
  const { mechanism, role } = await requireRole(args, args.params.id, "viewer");
  const db = args.context.db;
  const versions = await listSnapshots(db, mechanism.id);
  const search = new URL(args.request.url).searchParams;
  // Without a choice, compare the newest version with the one before it.
  const pick = (key: string, fallback: number | undefined) => {
    const parsed = snapshotId.safeParse(search.get(key));
    return parsed.success ? parsed.data : fallback;
  };
  const fromId = pick("from", versions[1]?.id ?? versions[0]?.id);
  const toId = pick("to", versions[0]?.id);
  const [from, to] = await Promise.all([fromId ? findSnapshot(db, mechanism.id, fromId) : null, toId ? findSnapshot(db, mechanism.id, toId) : null]);
  const plain = <T extends { at: Date }>(v: T) => ({ ...v, at: v.at.toISOString() });
  return {
    id: mechanism.id,
    title: mechanism.title,
    role,
    versions: versions.map(plain),
    from: from ? plain(from) : null,
    to: to ? plain(to) : null,
  };
}

const historyActions = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("name"), name: snapshotNameField }),
  z.object({ intent: z.literal("restore"), snapshotId }),
]);

export async function action(args: Route.ActionArgs) {
  const { mechanism, user } = await requireRole(args, args.params.id, "editor");
  const parsed = historyActions.safeParse(Object.fromEntries(await args.request.formData()));
  if (!parsed.success) return httpError("bad_input", parsed.error.issues[0].message);
  const input = parsed.data;
  const collab = args.context.collab;
  if (input.intent === "name") {
    await collab.createNamedSnapshot(mechanism.id, user.id, input.name);
    return { ok: `Saved this version as “${input.name}”.` };
  }
  const restored = await collab.restoreSnapshot(mechanism.id, user.id, input.snapshotId);
  if (!restored) throw httpError("not_found", "No such version of this mechanism.");
  return { ok: `Version #${input.snapshotId} is the current text again; the text before it stays in the history.` };
}

const kindLabel: Record<SnapshotKind, string> = { auto: "automatic", named: "named", restore: "restore" };
const kindTone: Record<SnapshotKind, string> = {
  auto: "bg-canvas text-muted border border-line",
  named: "bg-accent-soft text-accent",
  restore: "bg-signal-soft text-signal",
};

const lineTone: Record<DiffLine["kind"], string> = { same: "", added: "bg-ok-soft text-ok", removed: "bg-danger-soft text-danger" };
const lineMark: Record<DiffLine["kind"], string> = { same: " ", added: "+", removed: "−" };

export default function History({ loaderData, actionData }: Route.ComponentProps) {
  const { id, title, role, versions, from, to } = loaderData;
  const canEdit = atLeast(role, "editor");
  const busy = useNavigation().state === "submitting";
  const result = actionData as { ok?: string; error?: string } | undefined;
  return (
    <main className="mx-auto max-w-6xl px-6 py-8">
      <p className="text-xs text-muted"><Link to="/dashboard">Mechanisms</Link> / <Link to={`/m/${id}`}>{title}</Link></p>
      <h1 className="mt-1">History</h1>
      <p className="mt-1 text-sm text-muted">
        A version is kept whenever the structure settles into a new shape, and whenever an editor names one. Restoring puts an old text back as a new change.
      </p>

      {canEdit && (
        <Form method="post" className="card mt-6 flex flex-wrap items-end gap-3 p-4">
          <input type="hidden" name="intent" value="name" />
          <div className="min-w-64 flex-1">
            <label className="label" htmlFor="version-name">Name the current version</label>
            <input className="field" id="version-name" name="name" placeholder="before the second feedback loop" required maxLength={120} />
          </div>
          <button className="btn btn-primary" type="submit" disabled={busy}>Save version</button>
        </Form>
      )}
      {result?.error && <p className="notice-error mt-4" role="alert">{result.error}</p>}
      {result?.ok && <p className="notice-ok mt-4" role="status">{result.ok}</p>}

      {/* Restore buttons sit in the comparison table but submit this form (their `form` attribute). */}
      {canEdit && (
        <Form method="post" id="restore-version">
          <input type="hidden" name="intent" value="restore" />
        </Form>
      )}
      <Form method="get" className="card mt-6 overflow-x-auto">
        <table className="w-full text-sm">
          <thead className="bg-canvas/60 text-left text-xs uppercase tracking-wider text-muted">
            <tr>
              <th className="px-3 py-2.5 font-medium">From</th>
              <th className="px-3 py-2.5 font-medium">To</th>
              <th className="px-3 py-2.5 font-medium">When</th>
              <th className="px-3 py-2.5 font-medium">Kind</th>
              <th className="px-3 py-2.5 font-medium">Name</th>
              <th className="px-3 py-2.5 font-medium">Author</th>
              <th className="px-3 py-2.5 text-right font-medium">Deficiency</th>
              <th className="px-3 py-2.5 text-right font-medium">Species</th>
              <th className="px-3 py-2.5 text-right font-medium">Reactions</th>
              {canEdit && <th className="px-3 py-2.5" />}
            </tr>
          </thead>
          <tbody>
            {versions.map((v) => (
              <tr key={v.id} className="border-t border-line" data-testid={`version-${v.id}`}>
                <td className="px-3 py-2"><input type="radio" name="from" value={v.id} defaultChecked={v.id === from?.id} aria-label={`Compare from version ${v.id}`} /></td>
                <td className="px-3 py-2"><input type="radio" name="to" value={v.id} defaultChecked={v.id === to?.id} aria-label={`Compare to version ${v.id}`} /></td>
                <td className="px-3 py-2 whitespace-nowrap"><TimeAgo at={v.at} /> <span className="text-muted">#{v.id}</span></td>
                <td className="px-3 py-2"><span className={`pill ${kindTone[v.kind]}`}>{kindLabel[v.kind]}</span></td>
                <td className="px-3 py-2">{v.name ?? <span className="text-muted">—</span>}</td>
                <td className="px-3 py-2">{v.author ?? <span className="text-muted">—</span>}</td>
                <td className="px-3 py-2 text-right tabular-nums">{v.summary.deficiency}</td>
                <td className="px-3 py-2 text-right tabular-nums">{v.summary.species}</td>
                <td className="px-3 py-2 text-right tabular-nums">{v.summary.reactions}</td>
                {canEdit && (
                  <td className="px-3 py-2 text-right">
                    <button
                      className="btn"
                      type="submit"
                      form="restore-version"
                      name="snapshotId"
                      value={v.id}
                      disabled={busy}
                      onClick={(e) => { if (!confirm(`Make version #${v.id} the current text? The text before it stays in the history.`)) e.preventDefault(); }}
                    >
                      Restore
                    </button>
                  </td>
                )}
              </tr>
            ))}
            {versions.length === 0 && (
              <tr><td colSpan={10} className="px-3 py-6 text-center text-muted">No versions yet: the first one is kept a few seconds after the structure is first analysed.</td></tr>
            )}
          </tbody>
        </table>
        {versions.length > 1 && (
          <div className="border-t border-line p-3">
            <button className="btn" type="submit">Compare</button>
          </div>
        )}
      </Form>

      {from && to && (
        <section className="mt-8 space-y-4">
          <h2>
            Version #{from.id} → #{to.id}
          </h2>
          <p className="card bg-surface p-4 text-sm" data-testid="invariant-diff">
            <span className="text-muted">Structure and verdicts: </span>
            <span className="text-accent">{describeInvariantChanges(from.summary, to.summary)}</span>
          </p>
          <pre className="card overflow-x-auto p-0 text-sm leading-relaxed" data-testid="text-diff">
            {diffText(from.source, to.source).map((line, i) => (
              <div key={i} className={`flex gap-3 px-4 ${lineTone[line.kind]}`}>
                <span className="w-8 shrink-0 text-right text-muted select-none">{line.before ?? ""}</span>
                <span className="w-8 shrink-0 text-right text-muted select-none">{line.after ?? ""}</span>
                <span className="w-3 shrink-0 select-none">{lineMark[line.kind]}</span>
                <span className="whitespace-pre">{line.text || " "}</span>
              </div>
            ))}
          </pre>
        </section>
      )}
    </main>
  );
}
