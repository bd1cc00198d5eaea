import { defineConfig } from "drizzle-kit";

// Only `drizzle-kit generate` uses this file; the app applies migrations itself at start.
export default defineConfig({
  dialect: "postgresql",
  schema: "./server/db/schema.ts",
  out: "./drizzle",
});
