import { errorBody, statusOf, type ErrorCode } from "~/shared/error-codes";

/** The API's error shape: `{ "error": message, "code": code }`, with the code's status. */
export function httpError(code: ErrorCode, message: string, headers?: HeadersInit): Response {
  return Response.json(errorBody(code, message), { status: statusOf(code), headers });
}

/** 405 with the `Allow` header RFC 9110 asks for, naming the methods the endpoint answers. */
export function methodNotAllowed(allowed: readonly string[], hint = `Use ${allowed.join(" or ")}.`): Response {
  return httpError("method_not_allowed", hint, { Allow: allowed.join(", ") });
}

/** A route module's missing loader or action: every method it gets is a wrong one. */
export function onlyMethods(allowed: readonly string[], hint?: string) {
  return () => methodNotAllowed(allowed, hint);
}
