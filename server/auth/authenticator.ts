// remix-auth with two form strategies: "password" signs in, "sign-up" creates the account.
import { eq } from "drizzle-orm";
import { Authenticator } from "remix-auth";
import { FormStrategy } from "remix-auth-form";
import { z } from "zod";
import { personNameField } from "../../app/shared/fields";
import type { Db } from "../db/client";
import { users } from "../db/schema";
import { hashPassword, verifyPassword } from "./password";

export interface AuthUser {
  id: string;
  email: string;
  name: string;
  /** Whether the address was confirmed through a mailed link; seats granted by address wait for it. */
  verified: boolean;
}

export function toAuthUser(row: typeof users.$inferSelect): AuthUser {
  return { id: row.id, email: row.email, name: row.name, verified: row.emailVerifiedAt !== null };
}

/** A failure the user should read (wrong password, address taken…), not a server fault. */
export class AuthFailure extends Error {
  override name = "AuthFailure";
}

/**
 * Matched by name, not instanceof: route modules are bundled by Vite while the authenticator
 * is loaded by the server, so each side has its own copy of the class.
 */
export function isAuthFailure(error: unknown): error is AuthFailure {
  return error instanceof Error && error.name === "AuthFailure";
}

export const signInForm = z.object({
  email: z.string().trim().toLowerCase().email("Enter a valid e-mail address."),
  password: z.string().min(1, "Enter your password."),
});

export const signUpForm = z.object({
  name: personNameField,
  email: z.string().trim().toLowerCase().email("Enter a valid e-mail address.").max(254),
  password: z.string().min(10, "Use at least 10 characters for the password.").max(200),
});

function parseForm<T>(schema: z.ZodType<T>, form: FormData): T {
  const parsed = schema.safeParse(Object.fromEntries(form));
  if (!parsed.success) throw new AuthFailure(parsed.error.issues[0].message);
  return parsed.data;
}

/** A new account signs in at once; its address stays unverified unless `verified` (the demo seed). */
export async function createUser(db: Db, input: z.infer<typeof signUpForm>, options: { verified?: boolean } = {}): Promise<AuthUser> {
  const existing = await db.query.users.findFirst({ where: eq(users.email, input.email) });
  if (existing) throw new AuthFailure("An account with this e-mail address already exists. Sign in instead.");
  const [row] = await db
    .insert(users)
    .values({ email: input.email, name: input.name, passwordHash: await hashPassword(input.password), emailVerifiedAt: options.verified ? new Date() : null })
    .returning();
  return toAuthUser(row);
}

export function createAuthenticator(db: Db): Authenticator<AuthUser> {
  const authenticator = new Authenticator<AuthUser>();
  authenticator.use(
    new FormStrategy<AuthUser>(async ({ form }) => {
      const { email, password } = parseForm(signInForm, form);
      const user = await db.query.users.findFirst({ where: eq(users.email, email) });
      // Same message for unknown address and wrong password: do not reveal who has an account.
      if (!user || !(await verifyPassword(user.passwordHash, password))) {
        throw new AuthFailure("That e-mail address and password do not match an account.");
      }
      return toAuthUser(user);
    }),
    "password",
  );
  authenticator.use(
    new FormStrategy<AuthUser>(async ({ form }) => createUser(db, parseForm(signUpForm, form))),
    "sign-up",
  );
  return authenticator;
}
