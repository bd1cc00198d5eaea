import { Form } from "react-router";
import { RolePill } from "./role-pill";
import { TimeAgo } from "~/components/time-ago";

interface PendingInvitation {
  id: string;
  email: string;
  role: "editor" | "viewer";
  createdAt: string;
  expiresAt: string;
  expired: boolean;
  waitingForVerification: boolean;
}

export function InvitationsPanel({ invitations }: { invitations: PendingInvitation[] }) {
  return (
    <section className="mt-10">
      <h2>Pending invitations</h2>
      <p className="mt-1 text-sm text-muted">Each link works once, for a week. Resending makes a new link and retires the old one.</p>
      <div className="card mt-3 overflow-hidden">
        <table className="w-full text-sm">
          <tbody>
            {invitations.map((i) => (
              <tr key={i.id} className="border-t border-line first:border-t-0" data-testid={`invitation-${i.email}`}>
                <td className="px-4 py-3 font-medium">{i.email}</td>
                <td className="px-4 py-3"><RolePill role={i.role} /></td>
                <td className="px-4 py-3 text-muted">
                  {i.waitingForVerification ? (
                    <span title="The seat opens once they confirm their e-mail address">accepted, waiting for the address to be confirmed</span>
                  ) : i.expired ? (
                    <span className="text-danger">expired</span>
                  ) : (
                    <>sent <TimeAgo at={i.createdAt} /></>
                  )}
                </td>
                <td className="px-4 py-3">
                  <div className="flex justify-end gap-2">
                    {/* Accepted already: a new link would only undo the acceptance. */}
                    {!i.waitingForVerification && (
                      <Form method="post">
                        <input type="hidden" name="invitationId" value={i.id} />
                        <button className="btn" name="intent" value="resend" type="submit">Resend</button>
                      </Form>
                    )}
                    <Form method="post">
                      <input type="hidden" name="invitationId" value={i.id} />
                      <button className="btn btn-danger" name="intent" value="uninvite" type="submit">Withdraw</button>
                    </Form>
                  </div>
                </td>
              </tr>
            ))}
            {invitations.length === 0 && (
              <tr><td className="px-4 py-6 text-center text-muted">No invitations waiting for an answer.</td></tr>
            )}
          </tbody>
        </table>
      </div>
    </section>
  );
}
