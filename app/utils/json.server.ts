import type { z } from "zod";
import { byteSize, MAX_JSON_BODY_BYTES } from "~/chem/limits";
import { firstProblem } from "~/shared/fields";
import { httpError } from "./http";

const oversized = `The request body is over ${byteSize(MAX_JSON_BODY_BYTES)}.`;

/**
 * Parses and validates a JSON body, throwing the API's error shape (400, 413, 415) on bad input.
 * Only `application/json` is read: a page on another site can send `text/plain` or a form
 * without asking first (no CORS preflight), never `application/json`.
 */
export async function readJson<T>(request: Request, schema: z.ZodType<T>): Promise<T> {
  const mediaType = (request.headers.get("Content-Type") ?? "").split(";")[0].trim().toLowerCase();
  if (mediaType !== "application/json") throw httpError("unsupported_media_type", "Send the body as JSON, with Content-Type: application/json.");
  const declared = Number(request.headers.get("Content-Length") ?? 0);
  if (declared > MAX_JSON_BODY_BYTES) throw httpError("too_large", oversized);
  const text = await request.text();
  if (Buffer.byteLength(text) > MAX_JSON_BODY_BYTES) throw httpError("too_large", oversized);
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch {
    throw httpError("bad_input", "The request body is not valid JSON.");
  }
  const parsed = schema.safeParse(value);
  if (!parsed.success) throw httpError("bad_input", firstProblem(parsed.error));
  return parsed.data;
}
