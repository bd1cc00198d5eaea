import { randomBytes } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";

/**
 * SESSION_SECRET's secrets if set (the first signs, all verify), else one random secret kept in
 * .data/ so sessions survive restarts.
 */
export function sessionSecrets(projectRoot: string, fromEnv?: string[]): string[] {
  if (fromEnv?.length) return fromEnv;
  const file = path.join(projectRoot, ".data", "session-secret");
  if (!existsSync(file)) {
    mkdirSync(path.dirname(file), { recursive: true });
    writeFileSync(file, randomBytes(32).toString("hex"), { mode: 0o600 });
  }
  return [readFileSync(file, "utf8").trim()];
}
