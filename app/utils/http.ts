/** The API's error shape: `{ "error": message }` with its status. */
export function httpError(status: number, message: string): Response {
  return Response.json({ error: message }, { status });
}

/** 405 with the `Allow` header RFC 9110 asks for, naming the methods the endpoint answers. */
export function methodNotAllowed(allowed: readonly string[], hint = `Use ${allowed.join(" or ")}.`): Response {
  return Response.json({ error: hint }, { status: 405, headers: { Allow: allowed.join(", ") } });
}

/** A route module's missing loader or action: every method it gets is a wrong one. */
export function onlyMethods(allowed: readonly string[], hint?: string) {
  return () => methodNotAllowed(allowed, hint);
}
