import { useState } from "react";
import { Form } from "react-router";
import { TimeAgo } from "~/components/time-ago";

interface ViewLinkRow {
  id: string;
  hint: string;
  label: string;
  createdAt: string;
  expiresAt: string | null;
  status: "live" | "expired" | "revoked";
}

const statusTone = { live: "bg-ok-soft text-ok", expired: "bg-signal-soft text-signal", revoked: "bg-danger-soft text-danger" };

export function ViewLinksPanel({ links, newLink }: { links: ViewLinkRow[]; newLink?: string }) {
  const [copied, setCopied] = useState(false);
  return (
    <section className="mt-10">
      <h2>View links</h2>
      <p className="mt-1 text-sm text-muted">
        Anyone holding a live link sees this mechanism live and read-only — text, graph and structure — and nothing else. Put one in front of a class.
      </p>
      <Form method="post" className="card mt-3 flex flex-wrap items-end gap-3 p-4">
        <div className="min-w-56 flex-1">
          <label className="label" htmlFor="link-label">Label</label>
          <input className="field" id="link-label" name="label" placeholder="e.g. Tuesday seminar" maxLength={80} />
        </div>
        <div>
          <label className="label" htmlFor="link-days">Expires after (days)</label>
          <input className="field w-36" id="link-days" name="days" type="number" min={1} max={365} placeholder="never" />
        </div>
        <button className="btn btn-primary" name="intent" value="link" type="submit">Create view link</button>
      </Form>
      {newLink && (
        <div className="notice-ok mt-3 flex flex-wrap items-center gap-3">
          <code className="break-all text-xs" data-testid="new-view-link">{newLink}</code>
          <button
            type="button"
            className="btn"
            onClick={() => navigator.clipboard.writeText(newLink).then(() => setCopied(true))}
          >
            {copied ? "Copied" : "Copy"}
          </button>
        </div>
      )}
      <div className="card mt-3 overflow-hidden">
        <table className="w-full text-sm">
          <tbody>
            {links.map((l) => (
              <tr key={l.id} className="border-t border-line first:border-t-0">
                <td className="px-4 py-3"><code className="text-xs text-muted">…{l.hint}</code> <span className="font-medium">{l.label || "Untitled link"}</span></td>
                <td className="px-4 py-3 text-muted">created <TimeAgo at={l.createdAt} /></td>
                <td className="px-4 py-3 text-muted">{l.expiresAt ? <>expires <TimeAgo at={l.expiresAt} /></> : "no expiry"}</td>
                <td className="px-4 py-3"><span className={`pill ${statusTone[l.status]}`}>{l.status}</span></td>
                <td className="px-4 py-3 text-right">
                  {l.status === "live" && (
                    <Form method="post">
                      <input type="hidden" name="linkId" value={l.id} />
                      <button className="btn btn-danger" name="intent" value="unlink" type="submit">Revoke</button>
                    </Form>
                  )}
                </td>
              </tr>
            ))}
            {links.length === 0 && <tr><td className="px-4 py-6 text-center text-muted">No view links yet.</td></tr>}
          </tbody>
        </table>
      </div>
    </section>
  );
}
