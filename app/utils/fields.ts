// Field rules shared by forms and the JSON API, so both refuse the same input the same way.
import { z } from "zod";

export const titleField = z.string().trim().min(1, "Give the mechanism a title.").max(200, "Keep the title under 200 characters.");
export const MAX_SOURCE_BYTES = 1024 * 1024;
export const sourceField = z
  .string()
  .refine((s) => Buffer.byteLength(s, "utf8") <= MAX_SOURCE_BYTES, "The mechanism text is over 1 MiB; split it or trim comments.");
export const memberRoleField = z.enum(["editor", "viewer"], { message: "Choose editor or viewer." });
export const tokenNameField = z.string().trim().min(1, "Name the token, e.g. after the script that uses it.").max(80, "Keep the name under 80 characters.");
