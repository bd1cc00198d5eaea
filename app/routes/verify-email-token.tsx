// A confirmation link from the mail. Opening it only shows a button: mail scanners that fetch
// links must not use up the single-use token; the POST confirms. The loader answers a dead link
// with data and 404 rather than throwing, because it runs again right after a successful POST.
import { data, Form, Link } from "react-router";
import { lookUpEmailToken, verifyAddress } from "~/utils/accounts.server";
import { findMechanism } from "~/utils/mechanisms.server";
import { AuthCard } from "~/components/auth-card";
import type { Route } from "./+types/verify-email-token";
import { httpError } from "~/utils/http";

export const meta: Route.MetaFunction = () => [{ title: "Confirm your e-mail · Mechweave" }];

export async function loader({ context, params }: Route.LoaderArgs) {
  const found = await lookUpEmailToken(context.db, params.token, "verify");
  if (!found.ok) return data({ email: null, problem: found.reason }, { status: 404 });
  return { email: found.user.email, problem: null };
}

export async function action({ context, params }: Route.ActionArgs) {
  const result = await verifyAddress(context.db, params.token);
  if (!result.ok) return httpError("bad_input", result.reason);
  const joined = await Promise.all(result.joined.map(async (id) => ({ id, title: (await findMechanism(context.db, id))?.title ?? id })));
  // An explicit 200: the action's status, not the loader's 404 for the now-used link, is the page's.
  return data({ confirmed: result.user.email, joined }, { status: 200 });
}

export default function VerifyEmailToken({ loaderData, actionData }: Route.ComponentProps) {
  const result = actionData as { confirmed?: string; joined?: { id: string; title: string }[]; error?: string } | undefined;
  if (result?.confirmed) {
    return (
      <AuthCard title="Address confirmed" lead={`Thank you: ${result.confirmed} is confirmed.`} footer={<Link to="/dashboard">Go to your mechanisms</Link>}>
        {result.joined && result.joined.length > 0 && (
          <div className="notice-ok" role="status">
            <p>You joined:</p>
            <ul className="mt-1 list-disc pl-5">
              {result.joined.map((m) => <li key={m.id}><Link to={`/m/${m.id}`}>{m.title}</Link></li>)}
            </ul>
          </div>
        )}
      </AuthCard>
    );
  }
  if (!loaderData.email) {
    return (
      <AuthCard title="This link does not work" lead={result?.error ?? loaderData.problem ?? ""} footer={<Link to="/verify-email">Ask for a new link</Link>}>
        <p className="text-sm text-muted">Signed in, you can have a fresh link sent to your address.</p>
      </AuthCard>
    );
  }
  return (
    <AuthCard title="Confirm your e-mail address" lead={`Confirm that ${loaderData.email} is your address.`} footer={<Link to="/">Mechweave</Link>}>
      {result?.error && <p className="notice-error mb-4" role="alert">{result.error}</p>}
      <Form method="post">
        <button className="btn btn-primary w-full" type="submit">Confirm my address</button>
      </Form>
    </AuthCard>
  );
}
