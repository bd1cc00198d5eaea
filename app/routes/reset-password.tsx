// Choosing a new password from a mailed link: signs in afresh, ends every other session and revokes the access tokens.
// A dead link is answered with data and 404, not thrown, so a failed POST still shows its reason.
import { data, Form, Link, useNavigation } from "react-router";
import { lookUpEmailToken, resetPassword, signUpForm } from "~/utils/accounts.server";
import { AuthCard } from "~/components/auth-card";
import { Field } from "~/components/field";
import { startUserSession } from "~/utils/auth.server";
import type { Route } from "./+types/reset-password";
import { httpError } from "~/utils/http";

export const meta: Route.MetaFunction = () => [{ title: "Choose a new password · Mechweave" }];

const newPassword = signUpForm.pick({ password: true });

export async function loader({ context, params }: Route.LoaderArgs) {
  const found = await lookUpEmailToken(context.db, params.token, "reset");
  if (!found.ok) return data({ email: null, problem: found.reason }, { status: 404 });
  return { email: found.user.email, problem: null };
}

export async function action(args: Route.ActionArgs) {
  const parsed = newPassword.safeParse(Object.fromEntries(await args.request.formData()));
  if (!parsed.success) return httpError("bad_input", parsed.error.issues[0].message);
  const result = await resetPassword(args.context.db, args.params.token, parsed.data.password);
  if (!result.ok) return httpError("bad_input", result.reason);
  return startUserSession(args, result.user, "/dashboard");
}

export default function ResetPassword({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state !== "idle";
  const failed = actionData as { error?: string } | undefined;
  if (!loaderData.email) {
    return (
      <AuthCard title="This link does not work" lead={failed?.error ?? loaderData.problem ?? ""} footer={<Link to="/forgot-password">Ask for a new link</Link>}>
        <p className="text-sm text-muted">Reset links work once, for an hour; only the newest one works.</p>
      </AuthCard>
    );
  }
  return (
    <AuthCard
      title="Choose a new password"
      lead={`For ${loaderData.email}. Every other session of this account is signed out and its access tokens are revoked.`}
      footer={<Link to="/sign-in">Back to sign-in</Link>}
    >
      <Form method="post" className="space-y-4">
        <input type="hidden" name="username" value={loaderData.email} autoComplete="username" />
        <Field id="password" label="New password" name="password" type="password" autoComplete="new-password" minLength={10} required hint="At least 10 characters." />
        {failed?.error && <p className="notice-error" role="alert">{failed.error}</p>}
        <button className="btn btn-primary w-full" type="submit" disabled={busy}>{busy ? "Saving…" : "Save and sign in"}</button>
      </Form>
    </AuthCard>
  );
}
