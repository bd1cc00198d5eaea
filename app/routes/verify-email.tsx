// The signed-in account's address: confirmed or not, which seats wait for it, and a resend button.
import { Form, Link } from "react-router";
import { sentRecently } from "~/utils/accounts.server";
import { waitingSeats } from "~/utils/mechanisms.server";
import { AuthCard } from "~/components/auth-card";
import { sendVerification } from "~/utils/account-mail.server";
import { requireSessionUser } from "~/utils/auth.server";
import type { Route } from "./+types/verify-email";
import { httpError } from "~/utils/http";

export const meta: Route.MetaFunction = () => [{ title: "Confirm your e-mail · Mechweave" }];

export async function loader(args: Route.LoaderArgs) {
  const user = await requireSessionUser(args);
  const seats = user.verified ? [] : await waitingSeats(args.context.db, user.id);
  return { email: user.email, verified: user.verified, seats };
}

export async function action(args: Route.ActionArgs) {
  const user = await requireSessionUser(args);
  if (user.verified) return { ok: "Your address is already confirmed." };
  if (await sentRecently(args.context.db, user.id, "verify")) {
    return httpError("rate_limited", "A link went out less than a minute ago. Check your inbox, then try again.");
  }
  await sendVerification(args.context, args.request, user);
  return { ok: `A new link is on its way to ${user.email}. Earlier links no longer work.` };
}

export default function VerifyEmail({ loaderData, actionData }: Route.ComponentProps) {
  const { email, verified, seats } = loaderData;
  const result = actionData as { ok?: string; error?: string } | undefined;
  return (
    <AuthCard
      title={verified ? "Your address is confirmed" : "Confirm your e-mail address"}
      lead={verified ? `${email} is confirmed.` : `We sent a link to ${email}. Open it to confirm that the address is yours.`}
      footer={<Link to="/dashboard">Go to your mechanisms</Link>}
    >
      {seats.length > 0 && (
        <div className="notice-error mb-4" role="status" data-testid="waiting-seats">
          <p>These seats wait until you confirm your address:</p>
          <ul className="mt-1 list-disc pl-5">
            {seats.map((s) => <li key={s.mechanismId}>“{s.title}” as {s.role}</li>)}
          </ul>
        </div>
      )}
      {!verified && (
        <p className="text-sm text-muted">
          Your own mechanisms work already. Seats that others grant you by e-mail address open only once the address is confirmed.
        </p>
      )}
      {result?.error && <p className="notice-error mt-4" role="alert">{result.error}</p>}
      {result?.ok && <p className="notice-ok mt-4" role="status">{result.ok}</p>}
      {!verified && (
        <Form method="post" className="mt-4">
          <button className="btn w-full" type="submit">Send the link again</button>
        </Form>
      )}
    </AuthCard>
  );
}
