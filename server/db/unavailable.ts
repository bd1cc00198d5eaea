// Errors that mean PostgreSQL cannot be reached just now (stopped, restarting, out of
// connections), as opposed to a bug or bad data: the caller gets 503, as from /healthz.

const networkCodes = new Set(["ECONNREFUSED", "ECONNRESET", "ETIMEDOUT", "EHOSTUNREACH", "ENETUNREACH", "ENOTFOUND", "EAI_AGAIN", "EPIPE"]);
// SQLSTATE class 08 (connection exception), 57P01–57P03 (shutdown, crash, cannot connect now),
// 53300 (too many connections).
const unavailableStates = /^(08...|57P0[123]|53300)$/;
// pg's own messages for a connection that went away without a code.
const unavailableMessages = /Connection terminated|timeout exceeded when trying to connect|Client has encountered a connection error/;

/** Looks through Drizzle's wrapping (`cause`) to the driver's error. */
export function isDatabaseUnavailable(error: unknown): boolean {
  for (let current = error, depth = 0; current instanceof Error && depth < 5; current = current.cause, depth++) {
    const code = (current as { code?: unknown }).code;
    if (typeof code === "string" && (networkCodes.has(code) || unavailableStates.test(code))) return true;
    if (unavailableMessages.test(current.message)) return true;
  }
  return false;
}
