// Environment, parsed once at boot. Nothing here reaches the browser.
import { z } from "zod";

const schema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("production"),
  PORT: z.coerce.number().int().min(0).max(65535).default(3000),
  HOST: z.string().default("127.0.0.1"),
  DATABASE_URL: z.string().url().optional(),
  SMTP_URL: z.string().url().optional(),
  /** Where people reach Mechweave: the origin of every mailed or shared link; https makes cookies Secure. */
  PUBLIC_URL: z.url({ protocol: /^https?$/, message: "PUBLIC_URL must be an http or https URL." }).optional(),
  /**
   * Which proxies may speak for the client in X-Forwarded-For (Express's "trust proxy"): unset or
   * "false" believes nobody, a number that many hops, else addresses, subnets or "loopback".
   */
  TRUST_PROXY: z
    .string()
    .optional()
    .transform((value): boolean | number | string => {
      if (value === undefined || value === "" || value === "false") return false;
      if (value === "true") return true;
      return /^\d+$/.test(value) ? Number(value) : value;
    }),
  SESSION_SECRET: z.string().min(16).optional(),
  /** Seed the demo workspace even into an external database. */
  SEED_DEMO: z.enum(["0", "1"]).optional(),
  /** Time limit for analysing one text (HTTP and live rooms alike), in milliseconds. */
  ANALYSIS_TIME_LIMIT_MS: z.coerce.number().int().min(100).default(20_000),
});

export type Env = z.infer<typeof schema>;

export function readEnv(source: NodeJS.ProcessEnv = process.env): Env {
  const parsed = schema.safeParse(source);
  if (!parsed.success) {
    const problems = parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("; ");
    throw new Error(`bad environment: ${problems}`);
  }
  return parsed.data;
}
