// Bearer secrets (invitation links, view links, API tokens): 256 random bits, stored as SHA-256.
// A fast hash is enough here because the secret itself is not guessable, unlike a password.
import { createHash, randomBytes } from "node:crypto";

export function newSecret(prefix: string): { token: string; hash: string; hint: string } {
  const token = `${prefix}_${randomBytes(32).toString("base64url")}`;
  return { token, hash: hashSecret(token), hint: token.slice(-4) };
}

export function hashSecret(token: string): string {
  return createHash("sha256").update(token).digest("hex");
}
