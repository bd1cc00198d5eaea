import { Form, Link, useNavigation } from "react-router";
import { isAuthFailure, signInForm } from "~/utils/accounts.server";
import { AuthCard } from "~/components/auth-card";
import { Field } from "~/components/field";
import { redirectIfSignedIn, safeNext, startUserSession } from "~/utils/auth.server";
import type { Route } from "./+types/sign-in";

export const meta: Route.MetaFunction = () => [{ title: "Sign in · Mechweave" }];

/** The action's Retry-After reaches the page's response (React Router drops action headers otherwise). */
export const headers: Route.HeadersFunction = ({ actionHeaders }) => actionHeaders;

export async function loader(args: Route.LoaderArgs) {
  return redirectIfSignedIn(args);
}

export async function action(args: Route.ActionArgs) {
  const { request, context } = args;
  const form = await request.clone().formData();
  const email = String(form.get("email") ?? "").trim().toLowerCase();
  const next = safeNext(new URL(request.url).searchParams.get("next") ?? String(form.get("next") ?? ""));
  const parsed = signInForm.safeParse(Object.fromEntries(form));
  if (!parsed.success) return Response.json({ error: parsed.error.issues[0].message, email }, { status: 400 });
  const wait = Math.ceil((await context.signInLimits.wait(context.clientAddress, email)) / 1000);
  if (wait > 0) {
    const error = `Too many failed sign-ins from here. Wait ${wait < 120 ? `${wait} seconds` : `${Math.ceil(wait / 60)} minutes`} and try again, or reset your password.`;
    return Response.json({ error, email }, { status: 429, headers: { "Retry-After": String(wait) } });
  }
  try {
    const user = await context.authenticator.authenticate("password", request);
    await context.signInLimits.clear(context.clientAddress, email);
    return await startUserSession(args, user, next);
  } catch (error) {
    if (error instanceof Response) throw error;
    if (!isAuthFailure(error)) throw error;
    await context.signInLimits.recordFailure(context.clientAddress, email);
    return Response.json({ error: error.message, email }, { status: 401 });
  }
}

export default function SignIn({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state !== "idle";
  const failed = actionData as { error?: string; email?: string } | undefined;
  return (
    <AuthCard
      title="Sign in"
      lead="Welcome back to your mechanisms."
      footer={<>New here? <Link to="/sign-up">Create an account</Link>. Forgot your password? <Link to="/forgot-password">Reset it</Link>.</>}
    >
      <Form method="post" className="space-y-4">
        <input type="hidden" name="next" value={loaderData.next} />
        <Field id="email" label="E-mail" name="email" type="email" autoComplete="email" required defaultValue={failed?.email} />
        <Field id="password" label="Password" name="password" type="password" autoComplete="current-password" required />
        {failed?.error && <p className="notice-error" role="alert">{failed.error}</p>}
        <button className="btn btn-primary w-full" type="submit" disabled={busy}>{busy ? "Signing in…" : "Sign in"}</button>
      </Form>
    </AuthCard>
  );
}
