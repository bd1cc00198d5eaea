// A confirmation link from the mail. Opening it only shows a button: mail scanners that fetch
// links must not use up the single-use token; the POST confirms.
import { Form, Link } from "react-router";
import { lookUpEmailToken, verifyAddress } from "../../server/auth/email-tokens";
import { findMechanism } from "../../server/db/mechanisms";
import { AuthCard } from "~/components/auth-card";
import { httpError } from "~/utils/http";
import type { Route } from "./+types/verify-email-token";

export const meta: Route.MetaFunction = () => [{ title: "Confirm your e-mail · Mechweave" }];

export async function loader({ context, params }: Route.LoaderArgs) {
  const found = await lookUpEmailToken(context.db, params.token, "verify");
  if (!found.ok) throw httpError(404, found.reason);
  return { email: found.user.email };
}

export async function action({ context, params }: Route.ActionArgs) {
  const result = await verifyAddress(context.db, params.token);
  if (!result.ok) return Response.json({ error: result.reason }, { status: 400 });
  const joined = await Promise.all(result.joined.map(async (id) => ({ id, title: (await findMechanism(context.db, id))?.title ?? id })));
  return { confirmed: result.user.email, joined };
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
  return (
    <AuthCard title="Confirm your e-mail address" lead={`Confirm that ${loaderData.email} is your address.`} footer={<Link to="/">Mechweave</Link>}>
      {result?.error && <p className="notice-error mb-4" role="alert">{result.error}</p>}
      <Form method="post">
        <button className="btn btn-primary w-full" type="submit">Confirm my address</button>
      </Form>
    </AuthCard>
  );
}
