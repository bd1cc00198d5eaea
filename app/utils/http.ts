/** The API's error shape: `{ "error": message }` with its status. */
export function httpError(status: number, message: string): Response {
  return Response.json({ error: message }, { status });
}
