// The HTTP door: cross-site writes, JSON bodies, sign-out, security headers, stray WebSocket
// upgrades, wrong methods, odd inputs, and the database going away — against the real server.
import net from "node:net";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { adminUrl } from "../support/database";
import { Client, signUp } from "../support/http";
import { startTestServer } from "../support/server";

const PUBLIC_URL = "https://mechweave.example";
const FOREIGN = "https://elsewhere.example";

let server: Awaited<ReturnType<typeof startTestServer>>;
let owner: Awaited<ReturnType<typeof signUp>>;
let mechanismId: string;
const source = "A + B -> C @ 1\n";

beforeAll(async () => {
  server = await startTestServer({ PUBLIC_URL });
  owner = await signUp(server.url, "Dora Door");
  ({ id: mechanismId } = await (await owner.json("/api/v1/mechanisms", "POST", { title: "Door", source })).json());
});
afterAll(() => server?.dispose());

const mechanismCount = async () => (await (await owner.get("/api/v1/mechanisms")).json()).mechanisms.length as number;
const jsonHeaders = (origin?: string): Record<string, string> => ({ "Content-Type": "application/json", ...(origin ? { Origin: origin } : {}) });
const createTitled = (title: string, headers: Record<string, string>) =>
  owner.request("/api/v1/mechanisms", { method: "POST", headers, body: JSON.stringify({ title }) });

describe("cross-site requests", () => {
  it("refuses a foreign Origin on the API and on pages with 403, and changes nothing", async () => {
    const before = await mechanismCount();
    const api = await createTitled("from elsewhere", jsonHeaders(FOREIGN));
    expect(api.status).toBe(403);
    expect((await api.json()).error).toMatch(/other sites/);
    const plain = await owner.request("/api/v1/mechanisms", { method: "POST", headers: { "Content-Type": "text/plain", Origin: FOREIGN }, body: '{"title":"plain"}' });
    expect(plain.status).toBe(403);
    const page = await owner.request("/dashboard", { method: "POST", headers: { Origin: FOREIGN }, body: new URLSearchParams({ title: "form from elsewhere" }) });
    expect(page.status).toBe(403);
    // Sandboxed frames and cross-site redirects send "null": never this site.
    expect((await createTitled("null origin", jsonHeaders("null"))).status).toBe(403);
    const { id: tokenId } = await (await owner.json("/api/v1/tokens", "POST", { name: "kept" })).json();
    expect((await owner.request(`/api/v1/tokens/${tokenId}`, { method: "DELETE", headers: { Origin: FOREIGN } })).status).toBe(403);
    expect((await (await owner.get("/api/v1/tokens")).json()).tokens.some((t: { id: string }) => t.id === tokenId)).toBe(true);
    expect(await mechanismCount()).toBe(before);
  });

  it("reads JSON bodies only when sent as application/json (415 otherwise)", async () => {
    const before = await mechanismCount();
    for (const type of ["text/plain", "application/x-www-form-urlencoded", "multipart/form-data; boundary=x"]) {
      const response = await owner.request("/api/v1/mechanisms", { method: "POST", headers: { "Content-Type": type }, body: '{"title":"sneaky"}' });
      expect(response.status).toBe(415);
      expect((await response.json()).error).toMatch(/application\/json/);
    }
    expect(await mechanismCount()).toBe(before);
    expect((await createTitled("charset is fine", { "Content-Type": "application/json; charset=utf-8" })).status).toBe(201);
  });

  it("accepts this site's origin, PUBLIC_URL's, scripts that send none, and the app's own forms and uploads", async () => {
    expect((await createTitled("same host", jsonHeaders(server.url))).status).toBe(201);
    expect((await createTitled("public origin", jsonHeaders(PUBLIC_URL))).status).toBe(201);
    const { token } = await (await owner.json("/api/v1/tokens", "POST", { name: "script" })).json();
    const script = await fetch(`${server.url}/api/v1/mechanisms`, { method: "POST", headers: { ...jsonHeaders(), Authorization: `Bearer ${token}` }, body: '{"title":"by script"}' });
    expect(script.status).toBe(201);
    const form = await owner.request("/dashboard", { method: "POST", headers: { Origin: server.url }, body: new URLSearchParams({ title: "by form" }) });
    expect(form.status).toBe(302);
    const upload = new FormData();
    upload.set("file", new Blob([await (await owner.get(`/api/v1/mechanisms/${mechanismId}/export?format=sbml`)).text()]), "door.xml");
    expect((await owner.request("/api/v1/mechanisms/import", { method: "POST", headers: { Origin: server.url }, body: upload })).status).toBe(201);
  });
});

describe("sign-out", () => {
  it("is a POST: a GET (a link or an image elsewhere) answers 405 and signs nobody out", async () => {
    const client = await signUp(server.url, "Sid Signout");
    const get = await client.get("/sign-out");
    expect(get.status).toBe(405);
    expect(get.headers.get("Allow")).toBe("POST");
    expect((await client.get("/api/v1/mechanisms")).status).toBe(200);
    const post = await client.request("/sign-out", { method: "POST", headers: { Origin: server.url } });
    expect(post.status).toBe(302);
    expect((await client.get("/api/v1/mechanisms")).status).toBe(401);
  });
});

describe("security headers", () => {
  it("sends a CSP whose nonce is on every script of the page, fresh for each page, and refuses framing", async () => {
    const nonces = [];
    for (const path of ["/sign-in", "/sign-in"]) {
      const response = await fetch(server.url + path);
      expect(response.headers.get("X-Frame-Options")).toBe("DENY");
      const policy = response.headers.get("Content-Security-Policy") ?? "";
      expect(policy).toContain("frame-ancestors 'none'");
      const nonce = policy.match(/script-src 'self' 'nonce-([A-Za-z0-9+/=]+)'/)?.[1];
      expect(nonce).toBeTruthy();
      const scripts = (await response.text()).match(/<script[^>]*>/g) ?? [];
      expect(scripts.length).toBeGreaterThan(0);
      for (const tag of scripts) expect(tag).toContain(`nonce="${nonce}"`);
      nonces.push(nonce);
    }
    expect(nonces[0]).not.toBe(nonces[1]);
    expect((await owner.get("/api/v1/mechanisms")).headers.get("X-Frame-Options")).toBe("DENY");
  });
});

/** Opens a socket and asks it for a WebSocket upgrade at `target`. */
function sendUpgrade(target: string, base: string, headers: string): net.Socket {
  const { hostname, port } = new URL(base);
  const socket = net.connect(Number(port), hostname);
  socket.write(
    `GET ${target} HTTP/1.1\r\nHost: ${hostname}:${port}\r\nConnection: Upgrade\r\nUpgrade: websocket\r\n` +
      `Sec-WebSocket-Version: 13\r\nSec-WebSocket-Key: dGhlIHNhbXBsZSBub25jZQ==\r\n${headers}\r\n`,
  );
  return socket;
}

/** A raw upgrade request; resolves with what the server sent once the server closes the socket. */
function upgradeRequest(target: string, base = server.url, headers = ""): Promise<string> {
  return new Promise((resolve, reject) => {
    const socket = sendUpgrade(target, base, headers);
    let received = "";
    socket.on("data", (chunk) => (received += chunk.toString()));
    socket.on("error", reject);
    socket.on("close", () => resolve(received));
  });
}

/** The status line of the answer (the socket is then dropped: an accepted one would stay open). */
function upgradeStatus(target: string, headers: string): Promise<string> {
  return new Promise((resolve, reject) => {
    const socket = sendUpgrade(target, server.url, headers);
    socket.once("data", (chunk) => {
      resolve(chunk.toString().split("\r\n")[0]);
      socket.destroy();
    });
    socket.on("error", reject);
  });
}

describe("collaboration socket origins", () => {
  it("admits a page on this host or on PUBLIC_URL, and refuses another site's", async () => {
    const status = (origin: string) => upgradeStatus(`/collab/${mechanismId}`, `Cookie: ${owner.cookieHeader}\r\nOrigin: ${origin}\r\n`);
    expect(await status(server.url)).toBe("HTTP/1.1 101 Switching Protocols");
    expect(await status(PUBLIC_URL)).toBe("HTTP/1.1 101 Switching Protocols");
    expect(await status(FOREIGN)).toMatch(/^HTTP\/1\.1 403 /);
  });
});

describe("WebSocket upgrades off /collab", () => {
  it("answers 404 and closes the socket, for 200 at once", async () => {
    const answers = await Promise.all(Array.from({ length: 200 }, (_, i) => upgradeRequest(i % 2 ? `/elsewhere/${i}` : "/")));
    for (const answer of answers) {
      expect(answer).toMatch(/^HTTP\/1\.1 404 /);
      expect(answer).toContain('{"error":"WebSockets are served at /collab/:id only."}');
    }
  });

  it("answers 400 to a request target that is not a URL", async () => {
    expect(await upgradeRequest("//[")).toMatch(/^HTTP\/1\.1 400 /);
  });
});

describe("wrong methods on API routes", () => {
  const routes: [string, string[], string][] = [
    ["/api/v1/mechanisms", ["GET", "POST"], "DELETE"],
    ["/api/v1/mechanisms/import", ["POST"], "GET"],
    ["/api/v1/mechanisms/ID", ["GET"], "POST"],
    ["/api/v1/mechanisms/ID/export", ["GET"], "DELETE"],
    ["/api/v1/mechanisms/ID/source", ["PUT"], "GET"],
    ["/api/v1/mechanisms/ID/source", ["PUT"], "POST"],
    ["/api/v1/mechanisms/ID/snapshots", ["GET", "POST"], "PATCH"],
    ["/api/v1/mechanisms/ID/simulations", ["POST"], "GET"],
    ["/api/v1/mechanisms/ID/dynamics", ["POST"], "GET"],
    ["/api/v1/mechanisms/ID/invitations", ["POST"], "GET"],
    ["/api/v1/mechanisms/ID/view-links", ["GET", "POST"], "DELETE"],
    ["/api/v1/mechanisms/ID/view-links/00000000-0000-0000-0000-000000000000", ["DELETE"], "POST"],
    ["/api/v1/analyze", ["POST"], "GET"],
    ["/api/v1/realizations", ["POST"], "GET"],
    ["/api/v1/simulations", ["POST"], "GET"],
    ["/api/v1/tokens", ["GET", "POST"], "PUT"],
    ["/api/v1/tokens/00000000-0000-0000-0000-000000000000", ["DELETE"], "GET"],
    ["/api/dev/mail", ["GET"], "POST"],
  ];
  it.each(routes)("%s answers 405 with Allow: %s to %s", async (path, allowed, method) => {
    const response = await owner.request(path.replace("ID", mechanismId), { method });
    expect(response.status).toBe(405);
    expect(response.headers.get("Allow")).toBe(allowed.join(", "));
    expect(typeof (await response.json()).error).toBe("string");
  });

  it("answers OPTIONS with an empty 204 and no CORS grant, and other methods with 405, without running a page", async () => {
    for (const path of ["/api/v1/mechanisms", `/mechanisms/${mechanismId}`, "/dashboard"]) {
      const options = await owner.request(path, { method: "OPTIONS", headers: { Origin: FOREIGN } });
      expect(options.status).toBe(204);
      expect(options.headers.get("Access-Control-Allow-Origin")).toBeNull();
      expect(await options.text()).toBe("");
      const odd = await owner.request(path, { method: "PROPFIND" });
      expect(odd.status).toBe(405);
      expect(await odd.json()).toEqual({ error: "PROPFIND is not served here.", code: "method_not_allowed" });
    }
  });
});

describe("odd inputs", () => {
  const refused = async (response: Response, pattern: RegExp, status = 400) => {
    expect(response.status).toBe(status);
    expect((await response.json()).error).toMatch(pattern);
  };

  it("refuses NUL and other control characters in titles, names, labels and texts, and saves nothing", async () => {
    const before = await mechanismCount();
    await refused(await owner.json("/api/v1/mechanisms", "POST", { title: "Ozone\u0000" }), /title: The title holds the control character U\+0000/);
    await refused(await owner.json("/api/v1/mechanisms", "POST", { title: "ok", source: "A -> B\n\u001b[31m" }), /line 2, column 1/);
    await refused(await owner.json("/api/v1/mechanisms", "POST", { title: "ok", summary: "bell\u0007" }), /U\+0007/);
    const page = await owner.post("/dashboard", { title: "form\u0000title" });
    expect(page.status).toBe(400);
    expect(await mechanismCount()).toBe(before);

    await refused(await owner.json(`/api/v1/mechanisms/${mechanismId}/snapshots`, "POST", { name: "v\u00001" }), /U\+0000/);
    await refused(await owner.json(`/api/v1/mechanisms/${mechanismId}/view-links`, "POST", { label: "\u0000" }), /U\+0000/);
    await refused(await owner.json("/api/v1/tokens", "POST", { name: "t\u0000" }), /U\+0000/);
    const nulName = await new Client(server.url).post("/sign-up", { name: "Nul\u0000Name", email: `nul.${Date.now()}@example.test`, password: "correct horse battery" });
    expect(nulName.status).toBe(400);
    expect(await nulName.text()).toContain("The name holds the control character U+0000");
    await refused(await owner.json(`/api/v1/mechanisms/${mechanismId}/source`, "PUT", { source: "A -> B\u0000\n" }), /U\+0000/);
    expect((await (await owner.get(`/api/v1/mechanisms/${mechanismId}`)).json()).source).toBe(source);
    await refused(await owner.json("/api/v1/analyze", "POST", { source: "\u0000" }), /U\+0000/);
    await refused(await owner.json("/api/v1/simulations", "POST", { source: "A -> B @ 1\u0000", settings: { until: 1, samples: 2 } }), /U\+0000/);
    await refused(await owner.json("/api/v1/realizations", "POST", { ode: "x' = -x\u0000" }), /U\+0000/);
    const file = new FormData();
    file.set("file", new Blob(['<?xml version="1.0"?><sbml>\u0000</sbml>']), "nul.xml");
    await refused(await owner.request("/api/v1/mechanisms/import", { method: "POST", body: file }), /The file holds the control character U\+0000/);
    expect(await mechanismCount()).toBe(before);
  });

  it("keeps tab, line feed and carriage return", async () => {
    const text = "A + B -> C @ 1\r\n\tC -> A @ 2\n";
    expect((await owner.json(`/api/v1/mechanisms/${mechanismId}/source`, "PUT", { source: text })).status).toBe(200);
    expect((await owner.json(`/api/v1/mechanisms/${mechanismId}/source`, "PUT", { source })).status).toBe(200);
  });

  it("answers 400 or 404 with { error } to malformed ids and formats", async () => {
    await refused(await owner.request("/api/v1/tokens/not-a-uuid", { method: "DELETE" }), /not a token id/);
    await refused(await owner.request("/api/v1/tokens/00000000-0000-0000-0000-000000000000", { method: "DELETE" }), /No live token/, 404);
    await refused(await owner.request(`/api/v1/mechanisms/${mechanismId}/view-links/not-a-uuid`, { method: "DELETE" }), /not a view link id/);
    await refused(await owner.request(`/api/v1/mechanisms/${mechanismId}/view-links/00000000-0000-0000-0000-000000000000`, { method: "DELETE" }), /does not exist/, 404);
    for (const format of ["__proto__", "constructor", "toString"]) {
      await refused(await owner.get(`/api/v1/mechanisms/${mechanismId}/export?format=${format}`), /format=sbml, latex or csv/);
    }
    await refused(await owner.get("/api/v1/mechanisms/ab%00cd"), /No mechanism/, 404);
  });
});

/** A TCP proxy in front of the test cluster, which the test can take down and bring back. */
function databaseProxy() {
  const target = new URL(adminUrl());
  const sockets = new Set<net.Socket>();
  let listener: net.Server | null = null;
  let port = 0;
  return {
    get port() {
      return port;
    },
    async up() {
      listener = net.createServer((client) => {
        const upstream = net.connect(Number(target.port), target.hostname);
        for (const socket of [client, upstream]) {
          sockets.add(socket);
          socket.on("error", () => {});
          socket.on("close", () => {
            sockets.delete(socket);
            client.destroy();
            upstream.destroy();
          });
        }
        client.pipe(upstream).pipe(client);
      });
      await new Promise<void>((resolve) => listener!.listen(port, "127.0.0.1", resolve));
      port = (listener.address() as net.AddressInfo).port;
    },
    async down() {
      if (!listener?.listening) return;
      const closed = new Promise((resolve) => listener!.close(resolve));
      for (const socket of sockets) socket.destroy();
      await closed;
    },
  };
}

describe("the database going away", () => {
  const proxy = databaseProxy();
  let away: Awaited<ReturnType<typeof startTestServer>>;
  beforeAll(async () => {
    await proxy.up();
    away = await startTestServer({}, {
      databaseUrl: (url) => {
        const viaProxy = new URL(url);
        viaProxy.port = String(proxy.port);
        return viaProxy.toString();
      },
    });
  });
  afterAll(async () => {
    await away?.dispose();
    await proxy.down();
  });

  it("answers 503 on pages and the API as /healthz does, and recovers when it is back", async () => {
    const client = await signUp(away.url, "Abe Away");
    const { id } = await (await client.json("/api/v1/mechanisms", "POST", { title: "Kept" })).json();
    expect((await client.get("/dashboard")).status).toBe(200);
    await proxy.down();

    expect((await client.get("/healthz")).status).toBe(503);
    const api = await client.get("/api/v1/mechanisms");
    expect(api.status).toBe(503);
    expect((await api.json()).error).toMatch(/database is unavailable/);
    const write = await client.json("/api/v1/mechanisms", "POST", { title: "while away" });
    expect(write.status).toBe(503);
    const page = await client.get("/dashboard");
    expect(page.status).toBe(503);
    expect(page.headers.get("Content-Type")).toMatch(/text\/html/);
    expect(await page.text()).toContain("temporarily unavailable");
    expect(await upgradeRequest(`/collab/${id}`, away.url, `Cookie: ${client.cookieHeader}\r\n`)).toMatch(/^HTTP\/1\.1 503 /);

    await proxy.up();
    await expect.poll(async () => (await client.get("/healthz")).status, { timeout: 10_000 }).toBe(200);
    expect((await client.get("/api/v1/mechanisms")).status).toBe(200);
    expect((await client.get("/dashboard")).status).toBe(200);
  });
});
