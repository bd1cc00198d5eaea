// Bad usage of the command line (exit 2, a one-line message, no stack trace), and the check every
// command applies to its flags: the job kind's schema, the same the API and the worker use.
import type { z } from "zod";

export class UsageError extends Error {}

/** The settings as the job kind's schema reads them; a refusal is bad usage, naming the flag (`flags` maps settings to flags spelt otherwise). */
export function checkedSettings<T>(schema: z.ZodType<T>, settings: unknown, flags: Record<string, string> = {}): T {
  const parsed = schema.safeParse(settings);
  if (parsed.success) return parsed.data;
  const issue = parsed.error.issues[0];
  const path = issue.path.join(".");
  throw new UsageError(issue.path.length ? `--${flags[path] ?? path}: ${issue.message}` : issue.message);
}
