// Field rules shared by forms and the JSON API, so both refuse the same input the same way.
import { z } from "zod";
import { byteSize, MAX_LABEL_CHARS, MAX_NAME_CHARS, MAX_ODE_BYTES, MAX_SOURCE_BYTES, MAX_SUMMARY_CHARS, MAX_TITLE_CHARS } from "~/chem/limits";

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

const utf8Bytes = (text: string) => new TextEncoder().encode(text).length;

export const titleField = cleanText("The title").trim().min(1, "Give the mechanism a title.").max(MAX_TITLE_CHARS, `Keep the title under ${MAX_TITLE_CHARS} characters.`);
export const summaryField = cleanText("The summary").max(MAX_SUMMARY_CHARS, `Keep the summary under ${MAX_SUMMARY_CHARS} characters.`);
export const oversizedSourceMessage = `The mechanism text is over ${byteSize(MAX_SOURCE_BYTES)}; split it or trim comments.`;
/** A mechanism text within the size every part of Mechweave reads. */
export const sourceField = cleanText("The mechanism text").refine((s) => utf8Bytes(s) <= MAX_SOURCE_BYTES, oversizedSourceMessage);
/** A polynomial ODE text. */
export const odeField = cleanText("The ODE").refine((s) => utf8Bytes(s) <= MAX_ODE_BYTES, `The ODE text is over ${byteSize(MAX_ODE_BYTES)}.`);
export const memberRoleField = z.enum(["editor", "viewer"], { message: "Choose editor or viewer." });
export const tokenNameField = cleanText("The name").trim().min(1, "Name the token, e.g. after the script that uses it.").max(MAX_LABEL_CHARS, `Keep the name under ${MAX_LABEL_CHARS} characters.`);
export const labelField = cleanText("The label").trim().max(MAX_LABEL_CHARS, `Keep the label under ${MAX_LABEL_CHARS} characters.`);
/** The rule for a version's name, shared by the API and the History page. */
export const snapshotNameField = cleanText("The name").trim().min(1, "Give the version a name.").max(MAX_NAME_CHARS, `Keep the name under ${MAX_NAME_CHARS} characters.`);
/** A person's name at sign-up. */
export const personNameField = cleanText("The name").trim().min(1, "Enter your name.").max(MAX_NAME_CHARS, `Keep the name under ${MAX_NAME_CHARS} characters.`);
/** Mechanism ids as `newMechanismId` makes them, with room to spare; anything else is no mechanism. */
export const mechanismIdField = z.string().regex(/^[A-Za-z0-9_-]{1,64}$/);

/** The first problem of a refused input, as one line: `settings.samples: the number of samples …`. */
export function firstProblem(error: z.ZodError): string {
  const issue = error.issues[0];
  return issue.path.length ? `${issue.path.join(".")}: ${issue.message}` : issue.message;
}
