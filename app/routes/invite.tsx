// Accepting an invitation: sign in or sign up with the invited address, then take the role.
import { Form, Link, redirect } from "react-router";
import { z } from "zod";
import { createUser, isAuthFailure, signUpForm } from "~/utils/accounts.server";
import { acceptInvitation, isMembershipError, lookUpInvitation } from "~/utils/mechanisms.server";
import { AuthCard } from "~/components/auth-card";
import { Field } from "~/components/field";
import { sendVerification } from "~/utils/account-mail.server";
import { getUser, startUserSession } from "~/utils/auth.server";
import { httpError } from "~/utils/http";
import type { Route } from "./+types/invite";

export const meta: Route.MetaFunction = () => [{ title: "Invitation · Mechweave" }];

export async function loader(args: Route.LoaderArgs) {
  const found = await lookUpInvitation(args.context.db, args.params.token);
  if (!found.ok) throw httpError("not_found", found.reason);
  const user = await getUser(args);
  return {
    title: found.title,
    inviter: found.inviter,
    role: found.invitation.role,
    email: found.invitation.email,
    signedInAs: user?.email ?? null,
    verified: user?.verified ?? false,
  };
}

const acceptForm = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("accept") }),
  signUpForm.extend({ intent: z.literal("sign-up") }),
]);

export async function action(args: Route.ActionArgs) {
  const { context, params } = args;
  const parsed = acceptForm.safeParse(Object.fromEntries(await args.request.formData()));
  if (!parsed.success) return httpError("bad_input", parsed.error.issues[0].message);
  try {
    if (parsed.data.intent === "sign-up") {
      const found = await lookUpInvitation(context.db, params.token);
      if (!found.ok) return httpError("bad_input", found.reason);
      if (parsed.data.email !== found.invitation.email) return httpError("bad_input", `Use the invited address, ${found.invitation.email}.`);
      // The new account's address is not verified yet: the invitation waits for the mailed link.
      const user = await createUser(context.db, parsed.data);
      await acceptInvitation(context.db, params.token, user);
      await sendVerification(context, args.request, user);
      return await startUserSession(args, user, "/verify-email");
    }
    const user = await getUser(args);
    if (!user) return httpError("sign_in_required", "Sign in first.");
    const accepted = await acceptInvitation(context.db, params.token, user);
    throw redirect(accepted.waiting ? "/verify-email" : `/m/${accepted.mechanismId}`);
  } catch (error) {
    if (isAuthFailure(error) || isMembershipError(error)) {
      return httpError("bad_input", (error as Error).message);
    }
    throw error;
  }
}

export default function Invite({ loaderData, actionData, params }: Route.ComponentProps) {
  const { title, inviter, role, email, signedInAs, verified } = loaderData;
  const failed = actionData as { error?: string } | undefined;
  const next = encodeURIComponent(`/invite/${params.token}`);
  return (
    <AuthCard
      title={`Join “${title}”`}
      lead={`${inviter} invited ${email} as ${role === "editor" ? "an editor" : "a viewer"}.`}
      footer={signedInAs ? <>Not you? <Form method="post" action="/sign-out" className="inline"><button type="submit" className="cursor-pointer text-accent underline">Sign out</button></Form>.</> : <>Have an account with {email}? <Link to={`/sign-in?next=${next}`}>Sign in</Link> and come back to this link.</>}
    >
      {failed?.error && <p className="notice-error mb-4" role="alert">{failed.error}</p>}
      {signedInAs ? (
        <Form method="post" className="space-y-3">
          <p className="text-sm">Signed in as <strong>{signedInAs}</strong>.</p>
          {!verified && <p className="text-sm text-muted">Your address is not confirmed yet: the seat waits until you open the link we e-mail you.</p>}
          <button className="btn btn-primary w-full" name="intent" value="accept" type="submit">Accept and open the mechanism</button>
        </Form>
      ) : (
        <Form method="post" className="space-y-4">
          <input type="hidden" name="intent" value="sign-up" />
          <input type="hidden" name="email" value={email} />
          <Field id="name" label="Your name" name="name" required autoComplete="name" />
          <Field id="invite-email" label="E-mail" value={email} readOnly disabled />
          <Field id="password" label="Choose a password" name="password" type="password" minLength={10} required autoComplete="new-password" />
          <p className="text-sm text-muted">We then e-mail you a link to confirm the address; the seat opens once you do.</p>
          <button className="btn btn-primary w-full" type="submit">Create account and join</button>
        </Form>
      )}
    </AuthCard>
  );
}
