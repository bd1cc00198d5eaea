// Each test file gets its own database, cloned from the migrated template.
import { randomBytes } from "node:crypto";
import pg from "pg";

export const TEMPLATE_DATABASE = "mechweave_template";

export function adminUrl(): string {
  const url = process.env.MW_TEST_ADMIN_URL;
  if (!url) throw new Error("Database tests run through `npm test`, which starts the test cluster.");
  return url;
}

export async function createTestDatabase(): Promise<{ url: string; drop(): Promise<void> }> {
  const name = `mwt_${randomBytes(6).toString("hex")}`;
  const admin = new pg.Client(adminUrl());
  await admin.connect();
  await admin.query(`create database "${name}" template "${TEMPLATE_DATABASE}"`);
  await admin.end();
  const url = new URL(adminUrl());
  url.pathname = `/${name}`;
  return {
    url: url.toString(),
    async drop() {
      const client = new pg.Client(adminUrl());
      await client.connect();
      await client.query(`drop database if exists "${name}" with (force)`);
      await client.end();
    },
  };
}

/** One query on a test server's database, for setting up what the product has no button for (an expired link). */
export async function query(databaseUrl: string, text: string, values: unknown[] = []) {
  const client = new pg.Client(databaseUrl);
  await client.connect();
  try {
    return await client.query(text, values);
  } finally {
    await client.end();
  }
}
