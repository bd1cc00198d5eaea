import { Form, Link, useNavigation } from "react-router";
import { z } from "zod";
import { addMember, changeRole, findPendingInvitation, isMembershipError, listMembers, listViewLinks, pendingInvitations, removeMember, revokeInvitation, revokeViewLink, roleHistory, transferOwnership } from "~/utils/mechanisms.server";
import { InvitationsPanel } from "~/components/invitations-panel";
import { ViewLinksPanel } from "~/components/view-links-panel";
import { RolePill } from "~/components/role-pill";
import { labelField, memberRoleField } from "~/shared/fields";
import { TimeAgo } from "~/components/time-ago";
import { httpError } from "~/utils/http";
import { requireRole } from "~/utils/permissions.server";
import { inviteByEmail, makeViewLink, notifyRoleChange } from "~/utils/sharing.server";
import type { Route } from "./+types/members";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Members of ${data?.title ?? "mechanism"} · Mechweave` }];

export async function loader(args: Route.LoaderArgs) {
  const { mechanism, role, user } = await requireRole(args, args.params.id, "viewer");
  const db = args.context.db;
  const [members, history] = await Promise.all([listMembers(db, mechanism.id), roleHistory(db, mechanism.id)]);
  const owner = role === "owner";
  const iso = (d: Date | null) => d?.toISOString() ?? null;
  return {
    invitations: owner ? (await pendingInvitations(db, mechanism.id)).map((i) => ({ ...i, createdAt: iso(i.createdAt)!, expiresAt: iso(i.expiresAt)! })) : [],
    viewLinks: owner ? (await listViewLinks(db, mechanism.id)).map((l) => ({ ...l, createdAt: iso(l.createdAt)!, expiresAt: iso(l.expiresAt) })) : [],
    id: mechanism.id,
    title: mechanism.title,
    role,
    me: user.id,
    members,
    history: history.map((h) => ({ ...h, at: h.at.toISOString() })),
  };
}

const memberActions = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("add"), email: z.string().trim().toLowerCase().email("Enter a valid e-mail address."), role: memberRoleField }),
  z.object({ intent: z.literal("change"), userId: z.string().uuid(), role: memberRoleField }),
  z.object({ intent: z.literal("remove"), userId: z.string().uuid() }),
  z.object({ intent: z.literal("transfer"), userId: z.string().uuid() }),
  z.object({ intent: z.literal("invite"), email: z.string().trim().toLowerCase().email("Enter a valid e-mail address."), role: memberRoleField }),
  z.object({ intent: z.literal("resend"), invitationId: z.string().uuid() }),
  z.object({ intent: z.literal("uninvite"), invitationId: z.string().uuid() }),
  z.object({
    intent: z.literal("link"),
    label: labelField.default(""),
    days: z.union([z.literal(""), z.coerce.number().int().min(1, "Expiry is at least one day.").max(365, "Expiry is at most a year.")]).default(""),
  }),
  z.object({ intent: z.literal("unlink"), linkId: z.string().uuid() }),
]);

export async function action(args: Route.ActionArgs) {
  const { mechanism, user } = await requireRole(args, args.params.id, "owner");
  const parsed = memberActions.safeParse(Object.fromEntries(await args.request.formData()));
  if (!parsed.success) throw httpError("bad_input", parsed.error.issues[0].message);
  const input = parsed.data;
  const db = args.context.db;
  try {
    if (input.intent === "add") {
      const added = await addMember(db, user.id, mechanism.id, input.email, input.role);
      return { ok: `${added.name} can now work here as ${input.role}.` };
    }
    if (input.intent === "invite") {
      const invitation = await inviteByEmail(args.context, args.request, user, mechanism, input.email, input.role);
      return { ok: `Invitation sent to ${invitation.email}.` };
    }
    if (input.intent === "resend") {
      const pending = await findPendingInvitation(db, mechanism.id, input.invitationId);
      if (!pending) return httpError("bad_input", "That invitation is no longer pending.");
      await inviteByEmail(args.context, args.request, user, mechanism, pending.email, pending.role);
      return { ok: `A new link went to ${pending.email}; the old one no longer works.` };
    }
    if (input.intent === "uninvite") {
      await revokeInvitation(db, user.id, mechanism.id, input.invitationId);
      return { ok: "Invitation withdrawn." };
    }
    if (input.intent === "link") {
      const expiresAt = input.days === "" ? undefined : new Date(Date.now() + input.days * 86400_000);
      const link = await makeViewLink(args.context, args.request, user, mechanism.id, { label: input.label, expiresAt });
      return { ok: "View link created. Copy it now: it is shown only once.", newLink: link.url };
    }
    if (input.intent === "unlink") {
      await revokeViewLink(db, user.id, mechanism.id, input.linkId);
      return { ok: "View link revoked; anyone using it loses access at once." };
    }
    const member = (await listMembers(db, mechanism.id)).find((m) => m.userId === input.userId);
    if (input.intent === "change") await changeRole(db, user.id, mechanism.id, input.userId, input.role);
    if (input.intent === "remove") await removeMember(db, user.id, mechanism.id, input.userId);
    if (input.intent === "transfer") await transferOwnership(db, user.id, mechanism.id, input.userId);
    // Open sockets take the new role at once (the audit-trail feed would within a second).
    await args.context.collab.refreshRole(mechanism.id, input.userId);
    if (input.intent === "transfer") await args.context.collab.refreshRole(mechanism.id, user.id);
    if (member) {
      const newRole = input.intent === "change" ? input.role : input.intent === "transfer" ? "owner" : null;
      if (newRole !== member.role) await notifyRoleChange(args.context, args.request, { to: member.email, actor: user.name, mechanism, role: newRole });
    }
    return { ok: input.intent === "transfer" ? "Ownership transferred. You stay on as an editor." : "Saved." };
  } catch (error) {
    if (isMembershipError(error)) return httpError("bad_input", error.message);
    throw error;
  }
}

const actionWords: Record<string, string> = {
  grant: "added",
  change: "changed",
  revoke: "removed",
  transfer: "made owner",
  delete: "deleted",
  invite: "invited",
  uninvite: "withdrew the invitation of",
  accept: "— invitation accepted by",
  link: "created",
  unlink: "revoked",
};

export default function Members({ loaderData, actionData }: Route.ComponentProps) {
  const { members, role, history, id, title, invitations, viewLinks } = loaderData;
  const owner = role === "owner";
  const busy = useNavigation().state === "submitting";
  const result = actionData as { ok?: string; error?: string; newLink?: string } | undefined;
  return (
    <main className="mx-auto max-w-5xl px-6 py-8">
      <p className="text-xs text-muted"><Link to="/dashboard">Mechanisms</Link> / <Link to={`/m/${id}`}>{title}</Link></p>
      <h1 className="mt-1">Members</h1>
      <p className="mt-1 text-sm text-muted">
        Editors co-edit the text and layout and name versions; viewers see everything live but change nothing.
      </p>

      {owner && (
        <Form method="post" className="card mt-6 flex flex-wrap items-end gap-3 p-4">
          <div className="min-w-64 flex-1">
            <label className="label" htmlFor="email">Add or invite a person by e-mail</label>
            <input className="field" id="email" name="email" type="email" placeholder="colleague@example.test" required />
          </div>
          <div>
            <label className="label" htmlFor="role">Role</label>
            <select className="field" id="role" name="role" defaultValue="editor">
              <option value="editor">editor</option>
              <option value="viewer">viewer</option>
            </select>
          </div>
          <button className="btn btn-primary" type="submit" name="intent" value="add" disabled={busy} title="For someone who already has an account">Add member</button>
          <button className="btn" type="submit" name="intent" value="invite" disabled={busy} title="E-mails a single-use link, valid for a week">Send invitation</button>
        </Form>
      )}
      {result?.error && <p className="notice-error mt-4" role="alert">{result.error}</p>}
      {result?.ok && <p className="notice-ok mt-4" role="status">{result.ok}</p>}

      <div className="card mt-6 overflow-hidden">
        <table className="w-full text-sm">
          <thead className="bg-canvas/60 text-left text-xs uppercase tracking-wider text-muted">
            <tr><th className="px-4 py-2.5 font-medium">Person</th><th className="px-4 py-2.5 font-medium">Role</th>{owner && <th className="px-4 py-2.5 font-medium text-right">Manage</th>}</tr>
          </thead>
          <tbody>
            {members.map((m) => (
              <tr key={m.userId} className="border-t border-line" data-testid={`member-${m.email}`}>
                <td className="px-4 py-3"><div className="font-medium">{m.name}</div><div className="text-xs text-muted">{m.email}</div></td>
                <td className="px-4 py-3"><RolePill role={m.role} /></td>
                {owner && (
                  <td className="px-4 py-3">
                    {m.role !== "owner" && (
                      <div className="flex flex-wrap justify-end gap-2">
                        <Form method="post" className="flex gap-1">
                          <input type="hidden" name="intent" value="change" />
                          <input type="hidden" name="userId" value={m.userId} />
                          <select className="field py-1" name="role" defaultValue={m.role} aria-label={`Role of ${m.name}`}>
                            <option value="editor">editor</option>
                            <option value="viewer">viewer</option>
                          </select>
                          <button className="btn" type="submit">Change</button>
                        </Form>
                        <Form method="post" onSubmit={(e) => { if (!confirm(`Make ${m.name} the owner? You will become an editor.`)) e.preventDefault(); }}>
                          <input type="hidden" name="intent" value="transfer" />
                          <input type="hidden" name="userId" value={m.userId} />
                          <button className="btn" type="submit">Make owner</button>
                        </Form>
                        <Form method="post">
                          <input type="hidden" name="intent" value="remove" />
                          <input type="hidden" name="userId" value={m.userId} />
                          <button className="btn btn-danger" type="submit">Remove</button>
                        </Form>
                      </div>
                    )}
                  </td>
                )}
              </tr>
            ))}
          </tbody>
        </table>
      </div>

      {owner && <InvitationsPanel invitations={invitations} />}
      {owner && <ViewLinksPanel links={viewLinks} newLink={result?.newLink} />}

      <section className="mt-10">
        <h2>Role changes</h2>
        <ol className="mt-3 space-y-1.5 text-sm">
          {history.map((h, i) => (
            <li key={i} className="flex gap-3">
              <TimeAgo className="w-28 shrink-0 text-muted" at={h.at} />
              <span>
                {h.actor ?? "someone"} {actionWords[h.action] ?? h.action} <strong>{h.subjectEmail}</strong>
                {h.fromRole && h.toRole ? ` (${h.fromRole} → ${h.toRole})` : h.toRole ? ` as ${h.toRole}` : ""}
              </span>
            </li>
          ))}
          {history.length === 0 && <li className="text-muted">No changes yet.</li>}
        </ol>
      </section>
    </main>
  );
}
