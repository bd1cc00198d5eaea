import net from "node:net";
import pg from "pg";
import { describe, expect, it } from "vitest";
import { isDatabaseUnavailable } from "./unavailable";

describe("isDatabaseUnavailable", () => {
  it("recognises a refused connection, through a wrapping cause", async () => {
    // A port nobody listens on: bind one, then close it.
    const server = net.createServer().listen(0, "127.0.0.1");
    await new Promise((resolve) => server.once("listening", resolve));
    const { port } = server.address() as net.AddressInfo;
    await new Promise((resolve) => server.close(resolve));
    const error = await new pg.Client({ host: "127.0.0.1", port }).connect().catch((e: unknown) => e);
    expect(isDatabaseUnavailable(error)).toBe(true);
    expect(isDatabaseUnavailable(new Error("Failed query: select 1", { cause: error }))).toBe(true);
  });

  it("recognises a server shutting down, and not a bad query", () => {
    expect(isDatabaseUnavailable(Object.assign(new Error("terminating connection due to administrator command"), { code: "57P01" }))).toBe(true);
    expect(isDatabaseUnavailable(Object.assign(new Error('relation "nope" does not exist'), { code: "42P01" }))).toBe(false);
    expect(isDatabaseUnavailable(new TypeError("x is undefined"))).toBe(false);
    expect(isDatabaseUnavailable("a string")).toBe(false);
  });
});
