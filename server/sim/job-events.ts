// What crosses between the processes of one job while it runs, on one PostgreSQL channel: a new
// job wakes idle consumers, a consumer reports the start (the jobs behind it move up), progress
// and the end, a caller that went away asks
// for a cancel. Only ids and numbers travel (NOTIFY holds 8 KB); the job and its result stay in
// the queue's table. A missed event costs time, not correctness: callers also poll the job's state.
import pg from "pg";
import { z } from "zod";

const CHANNEL = "mechweave_job_events";
const RECONNECT_MS = 1_000;

const jobEvent = z.discriminatedUnion("type", [
  z.object({ type: z.literal("submitted") }),
  z.object({ type: z.literal("started"), id: z.string() }),
  z.object({ type: z.literal("progress"), id: z.string(), fraction: z.number(), note: z.object({ iteration: z.number(), cost: z.number() }).optional() }),
  z.object({ type: z.literal("finished"), id: z.string() }),
  z.object({ type: z.literal("cancel"), id: z.string() }),
]);

export type JobEvent = z.infer<typeof jobEvent>;

/** A LISTEN connection of its own (a pooled one may be handed to a query mid-wait) and a pool for sending. */
export class JobEvents {
  private listener: pg.Client | null = null;
  private readonly sender: pg.Pool;
  private readonly listeners = new Set<(event: JobEvent) => void>();
  private closed = false;

  constructor(private readonly databaseUrl: string) {
    this.sender = new pg.Pool({ connectionString: databaseUrl, max: 2 });
    this.sender.on("error", () => undefined);
  }

  async listen(): Promise<void> {
    const client = new pg.Client({ connectionString: this.databaseUrl });
    client.on("notification", ({ payload }) => {
      const event = jobEvent.safeParse(JSON.parse(payload ?? "null"));
      if (event.success) for (const listener of this.listeners) listener(event.data);
    });
    // A dropped connection is reopened; meanwhile the callers' polls carry on.
    client.on("error", () => this.reconnect(client));
    client.on("end", () => this.reconnect(client));
    await client.connect();
    await client.query(`LISTEN ${CHANNEL}`);
    this.listener = client;
  }

  private reconnect(client: pg.Client) {
    if (this.closed || this.listener !== client) return;
    this.listener = null;
    this.listenLater();
  }

  private listenLater() {
    setTimeout(() => {
      if (!this.closed) this.listen().catch(() => this.listenLater());
    }, RECONNECT_MS).unref();
  }

  on(listener: (event: JobEvent) => void): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  /** Sends an event to every process; a failure is dropped, since the polls make up for it. */
  async publish(event: JobEvent): Promise<void> {
    await this.sender.query("SELECT pg_notify($1, $2)", [CHANNEL, JSON.stringify(event)]).catch(() => undefined);
  }

  async close(): Promise<void> {
    this.closed = true;
    const listener = this.listener;
    this.listener = null;
    await Promise.allSettled([listener?.end(), this.sender.end()]);
  }
}
