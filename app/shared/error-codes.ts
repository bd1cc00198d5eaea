// Every error the API answers names a code, and its HTTP status comes from this one table: routes,
// the job runner and the Express app never choose a status themselves, and the API page lists the
// table as it is. An error class that a caller must tell apart carries its code as a `code`
// property, which survives the trip back from a worker thread and the bundler's split between
// route and server code (class identity does not).

export const errorCodes = {
  bad_input: { status: 400, meaning: "The input is malformed or names something the text does not have; the message says which field and why." },
  sign_in_required: { status: 401, meaning: "Not signed in, or an access token that is revoked or mistyped." },
  forbidden: { status: 403, meaning: "Your role is too low, the credential is the wrong kind (minting a token takes a browser session), or the change came from another site." },
  not_found: { status: 404, meaning: "No such endpoint or thing, or one not visible to you: its existence is not revealed." },
  method_not_allowed: { status: 405, meaning: "Wrong method; the Allow header lists the right ones." },
  too_large: { status: 413, meaning: "Over a size limit: the body, the file, the text, the model, the samples or the sweep points this server runs." },
  unsupported_media_type: { status: 415, meaning: "A body that is not application/json where JSON is read." },
  integration_failed: { status: 422, meaning: "The model is valid but the integrator gave up on it (step size underflow, values that are not finite)." },
  analysis_failed: { status: 422, meaning: "The text is valid but its analysis failed (an exact result too large to represent, a solver that refused)." },
  rate_limited: { status: 429, meaning: "An access token over its budget of requests; Retry-After says when to try again." },
  busy: { status: 429, meaning: "Too many of your jobs are waiting already; Retry-After says when to try again." },
  // Nobody reads 499 (the connection is gone): it is what the server records for a job cancelled
  // by closing its request, as nginx does, so a cancelled run never counts as a failure.
  cancelled: { status: 499, meaning: "You closed the request, which cancelled its job. Never received: it is what the server records." },
  time_limit: { status: 503, meaning: "The job ran into the server's time limit and was stopped; a smaller job, or later, may succeed." },
  unavailable: { status: 503, meaning: "The database is away just now; Retry-After says when to try again." },
} as const satisfies Record<string, { status: number; meaning: string }>;

export type ErrorCode = keyof typeof errorCodes;

export const statusOf = (code: ErrorCode): number => errorCodes[code].status;

export const isErrorCode = (value: unknown): value is ErrorCode => typeof value === "string" && Object.hasOwn(errorCodes, value);

/** The code an error carries, or null for an error nobody expected (a bug, a system error's own `code`). */
export function codeOf(error: unknown): ErrorCode | null {
  const code = error instanceof Error ? (error as { code?: unknown }).code : undefined;
  return isErrorCode(code) ? code : null;
}

/** The API's error body. */
export function errorBody(code: ErrorCode, message: string): { error: string; code: ErrorCode } {
  return { error: message, code };
}
