// Every error the API answers names a code, and its HTTP status comes from this one table: routes,
// the job runner and the Express app never choose a status themselves. An error class that a
// caller must tell apart carries its code as a `code` property, which survives the trip back from
// a worker thread and the bundler's split between route and server code (class identity does not).

export const statusOfCode = {
  /** The input is malformed or names something that does not exist in it; the message says which. */
  bad_input: 400,
  /** Not signed in, or an access token that is revoked or mistyped. */
  sign_in_required: 401,
  /** The role is too low, the credential is the wrong kind, or the request came from another site. */
  forbidden: 403,
  /** No such thing, or not visible to you: existence is not revealed to strangers. */
  not_found: 404,
  /** Wrong method; the `Allow` header lists the right ones. */
  method_not_allowed: 405,
  /** Over a size limit: the body, the file, the text, the model, the samples or the sweep. */
  too_large: 413,
  /** A body that is not `application/json` where JSON is read. */
  unsupported_media_type: 415,
  /** The model is valid but the integrator gave up on it (step size underflow, non-finite values). */
  integration_failed: 422,
  /** The text is valid but its analysis failed (an exact result too large to represent, a solver that refused). */
  analysis_failed: 422,
  /** An access token over its request budget; `Retry-After` says when to try again. */
  rate_limited: 429,
  /** Too many of your jobs are waiting; `Retry-After` says when to try again. */
  busy: 429,
  /**
   * The caller closed the request, which cancelled its job. Nobody reads this status (the
   * connection is gone); it is the status the server records, as nginx does, so a cancelled run
   * is never counted as a failure.
   */
  cancelled: 499,
  /** The job ran into the server's time limit and was stopped. */
  time_limit: 503,
  /** The database is away; `Retry-After` says when to try again. */
  unavailable: 503,
} as const satisfies Record<string, number>;

export type ErrorCode = keyof typeof statusOfCode;

export const isErrorCode = (value: unknown): value is ErrorCode => typeof value === "string" && Object.hasOwn(statusOfCode, value);

/** The code an error carries, or null for an error nobody expected (a bug, a system error's own `code`). */
export function codeOf(error: unknown): ErrorCode | null {
  const code = error instanceof Error ? (error as { code?: unknown }).code : undefined;
  return isErrorCode(code) ? code : null;
}

/** The API's error body. */
export function errorBody(code: ErrorCode, message: string): { error: string; code: ErrorCode } {
  return { error: message, code };
}
