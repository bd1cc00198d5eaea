import { sql } from "drizzle-orm";
import type { Route } from "./+types/healthz";

export async function loader({ context }: Route.LoaderArgs) {
  try {
    await context.db.execute(sql`select 1`);
    return Response.json({ ok: true, db: "up", instance: context.instance });
  } catch {
    return Response.json({ ok: false, db: "down", instance: context.instance }, { status: 503 });
  }
}
