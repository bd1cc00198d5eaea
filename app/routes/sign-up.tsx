import { Form, Link, useNavigation } from "react-router";
import { isAuthFailure } from "~/utils/accounts.server";
import { AuthCard } from "~/components/auth-card";
import { Field } from "~/components/field";
import { sendVerification } from "~/utils/account-mail.server";
import { redirectIfSignedIn, safeNext, startUserSession } from "~/utils/auth.server";
import type { Route } from "./+types/sign-up";

export const meta: Route.MetaFunction = () => [{ title: "Create an account · Mechweave" }];

export async function loader(args: Route.LoaderArgs) {
  return redirectIfSignedIn(args);
}

export async function action(args: Route.ActionArgs) {
  const form = await args.request.clone().formData();
  const next = safeNext(String(form.get("next") ?? ""));
  const echo = { name: String(form.get("name") ?? ""), email: String(form.get("email") ?? "") };
  try {
    const user = await args.context.authenticator.authenticate("sign-up", args.request);
    await sendVerification(args.context, args.request, user);
    return await startUserSession(args, user, next);
  } catch (error) {
    if (isAuthFailure(error)) return Response.json({ error: error.message, ...echo }, { status: 400 });
    throw error;
  }
}

export default function SignUp({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state !== "idle";
  const failed = actionData as { error?: string; name?: string; email?: string } | undefined;
  return (
    <AuthCard
      title="Create your account"
      lead="Free for your own mechanisms; invite co-authors when you are ready. We e-mail you a link to confirm your address."
      footer={<>Have an account? <Link to="/sign-in">Sign in</Link>.</>}
    >
      <Form method="post" className="space-y-4">
        <input type="hidden" name="next" value={loaderData.next} />
        <Field id="name" label="Name" name="name" autoComplete="name" required defaultValue={failed?.name} />
        <Field id="email" label="E-mail" name="email" type="email" autoComplete="email" required defaultValue={failed?.email} />
        <Field id="password" label="Password" name="password" type="password" autoComplete="new-password" minLength={10} required hint="At least 10 characters." />
        {failed?.error && <p className="notice-error" role="alert">{failed.error}</p>}
        <button className="btn btn-primary w-full" type="submit" disabled={busy}>{busy ? "Creating…" : "Create account"}</button>
      </Form>
    </AuthCard>
  );
}
