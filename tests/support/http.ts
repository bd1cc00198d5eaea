// A signed-in (or not) HTTP client against a test server: real requests, one cookie jar.
export class Client {
  private cookies = new Map<string, string>();

  constructor(readonly baseUrl: string) {}

  get cookieHeader(): string {
    return [...this.cookies].map(([k, v]) => `${k}=${v}`).join("; ");
  }

  async request(path: string, init: RequestInit = {}): Promise<Response> {
    const headers = new Headers(init.headers);
    if (this.cookies.size) headers.set("Cookie", this.cookieHeader);
    const response = await fetch(this.baseUrl + path, { ...init, headers, redirect: "manual" });
    for (const line of response.headers.getSetCookie()) {
      const [pair, ...attributes] = line.split(";");
      const [name, value] = [pair.slice(0, pair.indexOf("=")), pair.slice(pair.indexOf("=") + 1)];
      const expired = attributes.some((a) => /max-age=0|expires=thu, 01 jan 1970/i.test(a.trim()));
      if (expired || value === "") this.cookies.delete(name.trim());
      else this.cookies.set(name.trim(), value);
    }
    return response;
  }

  get(path: string) {
    return this.request(path);
  }

  /** A form post, as a browser without JavaScript sends it. */
  post(path: string, fields: Record<string, string>) {
    return this.request(path, { method: "POST", body: new URLSearchParams(fields) });
  }

  json(path: string, method: string, body?: unknown) {
    return this.request(path, { method, headers: { "Content-Type": "application/json" }, body: body === undefined ? undefined : JSON.stringify(body) });
  }
}

let counter = 0;

/** Signs up a fresh account and returns its client. */
export async function signUp(baseUrl: string, name = "Test Chemist"): Promise<Client & { email: string }> {
  const client = new Client(baseUrl) as Client & { email: string };
  client.email = `${name.toLowerCase().replace(/\W+/g, ".")}.${process.pid}.${++counter}.${Date.now()}@example.test`;
  const response = await client.post("/sign-up", { name, email: client.email, password: "correct horse battery" });
  if (response.status !== 302 && response.status !== 204) throw new Error(`sign-up failed: ${response.status} ${await response.text()}`);
  return client;
}
