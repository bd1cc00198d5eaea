import { readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { environmentKeys, hubTimings, jobSettings, publicOrigin, readEnv, signInSettings } from "./env";

const secretA = "a".repeat(16);
const secretB = "b".repeat(20);

describe("environment", () => {
  it("leaves every unset setting to its module's default", () => {
    const env = readEnv({});
    expect(hubTimings(env)).toEqual({ analysisTimeoutMs: 20_000 });
    expect(jobSettings(env)).toEqual({ limits: { analysisTimeMs: 20_000 }, threads: undefined, runningPerUser: undefined, queuedPerUser: undefined });
    expect(signInSettings(env)).toEqual({});
    expect(env.API_REQUESTS_PER_MINUTE).toBe(120);
    expect(env.SESSION_SECRET).toBeUndefined();
    expect(publicOrigin(env)).toBeNull();
  });

  it("passes what is set to the modules, as numbers", () => {
    const env = readEnv({
      WORKER_THREADS: "3",
      JOB_TIME_LIMIT_MS: "5000",
      JOBS_QUEUED_PER_USER: "0",
      SIGN_IN_FREE_FAILURES: "2",
      COLLAB_HEARTBEAT_MS: "500",
      COLLAB_COMPACT_EVERY: "50",
      PUBLIC_URL: "https://mechweave.example.test/some/path",
    });
    expect(env.WORKER_THREADS).toBe(3);
    expect(jobSettings(env)).toMatchObject({ limits: { timeMs: 5000 }, queuedPerUser: 0 });
    expect(signInSettings(env)).toEqual({ freeFailures: 2 });
    expect(hubTimings(env)).toEqual({ heartbeatMs: 500, compactEvery: 50, analysisTimeoutMs: 20_000 });
    expect(publicOrigin(env)).toBe("https://mechweave.example.test");
  });

  it("reads SESSION_SECRET as a list, the signing secret first", () => {
    expect(readEnv({ SESSION_SECRET: secretA }).SESSION_SECRET).toEqual([secretA]);
    expect(readEnv({ SESSION_SECRET: `${secretB}, ${secretA}` }).SESSION_SECRET).toEqual([secretB, secretA]);
    expect(() => readEnv({ SESSION_SECRET: `${secretB},short` })).toThrow(/SESSION_SECRET.*at least 16 characters/);
  });

  it("refuses bad values, naming each bad key", () => {
    expect(() => readEnv({ WORKER_THREADS: "0", COLLAB_HEARTBEAT_MS: "soon" })).toThrow(/WORKER_THREADS.*COLLAB_HEARTBEAT_MS/);
    expect(() => readEnv({ JOBS_RUNNING_PER_USER: "1.5" })).toThrow(/JOBS_RUNNING_PER_USER/);
    expect(() => readEnv({ PUBLIC_URL: "ftp://mechweave.example.test" })).toThrow(/PUBLIC_URL must be an http or https URL/);
  });

  it("documents every key in DEVELOPERS.md's table", () => {
    const guide = readFileSync(path.resolve(import.meta.dirname, "../DEVELOPERS.md"), "utf8");
    const documented = new Set([...guide.matchAll(/^\| `([A-Z_]+)` \|/gm)].map((m) => m[1]));
    expect(environmentKeys.filter((key) => !documented.has(key))).toEqual([]);
    expect([...documented].filter((key) => !environmentKeys.includes(key))).toEqual([]);
  });
});
