// Field rules shared by forms and the JSON API, so both refuse the same input the same way.
import { z } from "zod";
import { MAX_SOURCE_BYTES } from "~/chem/limits";

// C0 controls other than tab, line feed and carriage return: PostgreSQL cannot store NUL in
// text, and none of the others belongs in a title, a name or a mechanism.
const controlCharacter = /[\u0000-\u0008\u000B\u000C\u000E-\u001F]/;

/** Where a text holds a control character, for a message a person can act on; null if clean. */
export function controlCharacterProblem(text: string): string | null {
  const match = controlCharacter.exec(text);
  if (!match) return null;
  const before = text.slice(0, match.index).split("\n");
  const code = match[0].charCodeAt(0).toString(16).toUpperCase().padStart(4, "0");
  return `holds the control character U+${code} at line ${before.length}, column ${before[before.length - 1].length + 1}; remove it.`;
}

/** Every text that enters over HTTP goes through this: a string without control characters. */
export function cleanText(what: string) {
  return z.string({ message: `${what} must be text.` }).check((ctx) => {
    const problem = controlCharacterProblem(ctx.value);
    if (problem) ctx.issues.push({ code: "custom", message: `${what} ${problem}`, input: ctx.value });
  });
}

export const titleField = cleanText("The title").trim().min(1, "Give the mechanism a title.").max(200, "Keep the title under 200 characters.");
export const sourceField = cleanText("The mechanism text").refine(
  (s) => Buffer.byteLength(s, "utf8") <= MAX_SOURCE_BYTES,
  "The mechanism text is over 1 MiB; split it or trim comments.",
);
export const memberRoleField = z.enum(["editor", "viewer"], { message: "Choose editor or viewer." });
export const tokenNameField = cleanText("The name").trim().min(1, "Name the token, e.g. after the script that uses it.").max(80, "Keep the name under 80 characters.");
export const labelField = cleanText("The label").trim().max(80, "Keep the label under 80 characters.");
/** Mechanism ids as `newMechanismId` makes them, with room to spare; anything else is no mechanism. */
export const mechanismIdField = z.string().regex(/^[A-Za-z0-9_-]{1,64}$/);
