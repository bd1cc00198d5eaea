// Asking for a password-reset link. The answer is the same whether or not the address has an account.
import { Form, Link, useNavigation } from "react-router";
import { z } from "zod";
import { AuthCard } from "~/components/auth-card";
import { Field } from "~/components/field";
import { requestPasswordReset } from "~/utils/account-mail.server";
import type { Route } from "./+types/forgot-password";
import { httpError } from "~/utils/http";

export const meta: Route.MetaFunction = () => [{ title: "Forgot your password · Mechweave" }];

const resetRequest = z.object({ email: z.string().trim().toLowerCase().email("Enter a valid e-mail address.").max(254) });

export async function action({ request, context }: Route.ActionArgs) {
  const parsed = resetRequest.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) return httpError("bad_input", parsed.error.issues[0].message);
  requestPasswordReset(context, request, parsed.data.email);
  return { sent: parsed.data.email };
}

export default function ForgotPassword({ actionData }: Route.ComponentProps) {
  const busy = useNavigation().state !== "idle";
  const result = actionData as { sent?: string; error?: string } | undefined;
  return (
    <AuthCard
      title="Forgot your password"
      lead="We e-mail you a link to choose a new one. It works once, for an hour."
      footer={<>Remembered it? <Link to="/sign-in">Sign in</Link>.</>}
    >
      {result?.sent ? (
        <p className="notice-ok" role="status">
          If an account uses {result.sent}, a link to choose a new password is on its way. Check your inbox.
        </p>
      ) : (
        <Form method="post" className="space-y-4">
          <Field id="email" label="E-mail" name="email" type="email" autoComplete="email" required />
          {result?.error && <p className="notice-error" role="alert">{result.error}</p>}
          <button className="btn btn-primary w-full" type="submit" disabled={busy}>Send the link</button>
        </Form>
      )}
    </AuthCard>
  );
}
