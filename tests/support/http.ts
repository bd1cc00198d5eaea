// A signed-in (or not) HTTP client against a test server: real requests, one cookie jar.
import { DEMO_PASSWORD, demoAccounts } from "../../server/seed/demo";
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

  /** The same session against another app instance on the same database. */
  at(baseUrl: string): Client {
    const client = new Client(baseUrl);
    for (const [name, value] of this.cookies) client.cookies.set(name, value);
    return client;
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

export async function signIn(baseUrl: string, email: string, password: string): Promise<Client> {
  const client = new Client(baseUrl);
  const response = await client.post("/sign-in", { email, password });
  if (response.status !== 302) throw new Error(`sign-in as ${email} failed: ${response.status} ${await response.text()}`);
  return client;
}

const mailReaders = new Map<string, Promise<Client>>();

/** The demo owner, signed in once per server: the one account that may read the mail catcher. */
export function demoOwner(baseUrl: string): Promise<Client> {
  let reader = mailReaders.get(baseUrl);
  if (!reader) mailReaders.set(baseUrl, (reader = signIn(baseUrl, demoAccounts[0].email, DEMO_PASSWORD)));
  return reader;
}

export interface Mail {
  to: string;
  subject: string;
  text: string;
}

/** Every caught message to `address`, newest first. */
export async function mailTo(baseUrl: string, address: string): Promise<Mail[]> {
  const response = await (await demoOwner(baseUrl)).get("/api/dev/mail");
  if (response.status !== 200) throw new Error(`reading the mail catcher failed: ${response.status}`);
  const { messages } = (await response.json()) as { messages: Mail[] };
  return messages.filter((m) => m.to.split(", ").includes(address));
}

/**
 * Waits for the newest message to `address` whose subject contains `subject` (some mail leaves in
 * the background). A plain loop rather than vi.waitFor: the benchmarks use this outside vitest.
 */
export async function waitForMail(baseUrl: string, address: string, subject: string, timeoutMs = 10_000): Promise<Mail> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const mail = (await mailTo(baseUrl, address)).find((m) => m.subject.includes(subject));
    if (mail) return mail;
    if (Date.now() > deadline) throw new Error(`no mail to ${address} about “${subject}” within ${timeoutMs} ms`);
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
}

/** The first link in a mail that goes to `path` (e.g. "/invite/"). */
export function linkIn(mail: Mail, path: string): URL {
  const found = mail.text.match(new RegExp(`https?://\\S+${path}\\S+`));
  if (!found) throw new Error(`no ${path} link in “${mail.subject}”`);
  return new URL(found[0]);
}

export const VERIFY_SUBJECT = "Confirm your e-mail address";

/** Follows the newest confirmation link mailed to `email`, as its owner would. */
export async function confirmAddress(baseUrl: string, email: string): Promise<Response> {
  const link = linkIn(await waitForMail(baseUrl, email, VERIFY_SUBJECT), "/verify-email/");
  return new Client(baseUrl).post(link.pathname, {});
}

/** Signs up a fresh account, confirms its address through the mailed link and returns its client. */
export async function signUp(baseUrl: string, name = "Test Chemist"): Promise<Client & { email: string }> {
  const client = await signUpUnconfirmed(baseUrl, name);
  const confirmed = await confirmAddress(baseUrl, client.email);
  if (confirmed.status !== 200) throw new Error(`confirming ${client.email} failed: ${confirmed.status} ${await confirmed.text()}`);
  return client;
}

/** Signs up a fresh account and leaves its address unconfirmed. */
export async function signUpUnconfirmed(baseUrl: string, name = "Test Chemist"): Promise<Client & { email: string }> {
  const client = new Client(baseUrl) as Client & { email: string };
  client.email = `${name.toLowerCase().replace(/\W+/g, ".")}.${process.pid}.${++counter}.${Date.now()}@example.test`;
  const response = await client.post("/sign-up", { name, email: client.email, password: "correct horse battery" });
  if (response.status !== 302 && response.status !== 204) throw new Error(`sign-up failed: ${response.status} ${await response.text()}`);
  return client;
}

/** A new mechanism of `owner`'s, made through the API; its id. */
export async function createMechanism(owner: Client, source = "", title = "Shared mechanism"): Promise<string> {
  const response = await owner.json("/api/v1/mechanisms", "POST", { title, source });
  if (response.status !== 201) throw new Error(`creating a mechanism failed: ${response.status} ${await response.text()}`);
  return ((await response.json()) as { id: string }).id;
}

/** A fresh account added to the mechanism by its owner, with `role`. */
export async function addMember(owner: Client, id: string, role: "editor" | "viewer", name: string) {
  const person = await signUp(owner.baseUrl, name);
  const response = await owner.post(`/m/${id}/members`, { intent: "add", email: person.email, role });
  if (response.status !== 200) throw new Error(`adding ${person.email} failed: ${response.status}`);
  return person;
}

/** A member's user id, as the members page shows it to the owner. */
export async function memberUserId(owner: Client, id: string, email: string): Promise<string> {
  const page = await (await owner.get(`/m/${id}/members`)).text();
  return page.slice(page.indexOf(`member-${email}`)).match(/name="userId" value="([0-9a-f-]{36})"/)![1];
}
