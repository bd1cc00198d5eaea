import { drizzle, type NodePgDatabase } from "drizzle-orm/node-postgres";
import { migrate } from "drizzle-orm/node-postgres/migrator";
import path from "node:path";
import pg from "pg";
import * as schema from "./schema";

export type Db = NodePgDatabase<typeof schema>;

export interface Database {
  db: Db;
  pool: pg.Pool;
  close(): Promise<void>;
}

export function connect(url: string): Database {
  const pool = new pg.Pool({ connectionString: url, max: 20 });
  // An idle client losing its server (e.g. on shutdown) must not crash the process.
  pool.on("error", (error) => console.error(`[db] idle client error: ${error.message}`));
  const db = drizzle(pool, { schema });
  return { db, pool, close: () => pool.end() };
}

export async function applyMigrations(db: Db, projectRoot: string) {
  await migrate(db, { migrationsFolder: path.join(projectRoot, "drizzle") });
}

/** Creates `name` on the server behind `adminUrl` unless it exists; returns its URL. */
export async function ensureDatabase(adminUrl: string, name: string): Promise<string> {
  const client = new pg.Client(adminUrl);
  await client.connect();
  try {
    const found = await client.query("select 1 from pg_database where datname = $1", [name]);
    if (found.rowCount === 0) await client.query(`create database "${name.replace(/"/g, '""')}"`);
  } finally {
    await client.end();
  }
  const url = new URL(adminUrl);
  url.pathname = `/${name}`;
  return url.toString();
}
