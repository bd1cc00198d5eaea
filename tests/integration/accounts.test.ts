import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_PASSWORD, demoAccounts } from "../../server/seed/demo";
import { Client, confirmAddress, demoOwner, linkIn, mailTo, signIn, signUp, signUpUnconfirmed, VERIFY_SUBJECT, waitForMail } from "../support/http";
import { query } from "../support/database";
import { startTestServer } from "../support/server";

type Server = Awaited<ReturnType<typeof startTestServer>>;
let server: Server;
beforeAll(async () => {
  server = await startTestServer();
});
afterAll(() => server?.dispose());

const sql = (on: Server, text: string, values: unknown[] = []) => query(on.databaseUrl, text, values);

const RESET_SUBJECT = "Choose a new Mechweave password";

describe("accounts", () => {
  it("answers the health check with the database up, naming the instance", async () => {
    const response = await fetch(`${server.url}/healthz`);
    expect(response.status).toBe(200);
    expect(await response.json()).toEqual({ ok: true, db: "up", instance: expect.stringMatching(/^.+-\d+-[0-9a-f]{6}$/) });
  });

  it("signs up, keeps the session in an httpOnly SameSite cookie, and signs out", async () => {
    const client = new Client(server.url);
    const response = await client.post("/sign-up", { name: "Ada Rivers", email: "ada.rivers@example.test", password: "long enough password" });
    expect(response.status).toBe(302);
    expect(response.headers.get("Location")).toBe("/dashboard");
    const cookie = response.headers.getSetCookie().join(";");
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    // Without PUBLIC_URL on https the cookie must still work over plain http.
    expect(cookie).not.toMatch(/Secure/i);
    expect((await client.get("/dashboard")).status).toBe(200);
    expect((await client.post("/sign-out", {})).status).toBe(302);
    expect((await client.get("/dashboard")).status).toBe(302);
  });

  it("refuses a second account on the same address and a short password", async () => {
    await signUp(server.url, "First Owner");
    const client = new Client(server.url);
    const short = await client.post("/sign-up", { name: "Short", email: "short@example.test", password: "abc" });
    expect(short.status).toBe(400);
    expect(await short.text()).toContain("at least 10 characters");
    await client.post("/sign-up", { name: "Dup", email: "dup@example.test", password: "long enough password" });
    const again = await new Client(server.url).post("/sign-up", { name: "Dup", email: "DUP@example.test", password: "long enough password" });
    expect(again.status).toBe(400);
    expect(await again.text()).toContain("already exists");
  });

  it("slows guessing from an address, and a forged X-Forwarded-For does not get round it", async () => {
    await new Client(server.url).post("/sign-up", { name: "Lim", email: "limited@example.test", password: "the right password" });
    const ok = await new Client(server.url).post("/sign-in", { email: "limited@example.test", password: "the right password" });
    expect(ok.status).toBe(302);
    const wrong = await new Client(server.url).post("/sign-in", { email: "limited@example.test", password: "wrong" });
    expect(wrong.status).toBe(401);
    // Without TRUST_PROXY the header is anyone's to write: every try counts for the real address.
    for (let i = 0; i < 8; i++) {
      await new Client(server.url).request("/sign-in", {
        method: "POST",
        headers: { "X-Forwarded-For": `203.0.113.${i + 1}` },
        body: new URLSearchParams({ email: "limited@example.test", password: `wrong ${i}` }),
      });
    }
    const blocked = await new Client(server.url).request("/sign-in", {
      method: "POST",
      headers: { "X-Forwarded-For": "198.51.100.99" },
      body: new URLSearchParams({ email: "limited@example.test", password: "the right password" }),
    });
    expect(blocked.status).toBe(429);
    expect(Number(blocked.headers.get("Retry-After"))).toBeGreaterThan(0);
  });

  it("does not follow a sign-in redirect off the site", async () => {
    await new Client(server.url).post("/sign-up", { name: "Nav", email: "nav@example.test", password: "the right password" });
    // "//host", a backslash (read as "/" by browsers) and an encoded tab (dropped by browsers).
    for (const next of ["//evil.example", "/\\evil.example/x", "/\t/evil.example", "/..//evil.example"]) {
      const response = await new Client(server.url).post(`/sign-in?next=${encodeURIComponent(next)}`, { email: "nav@example.test", password: "the right password" });
      expect(response.headers.get("Location"), next).toBe("/dashboard");
    }
    const raw = await new Client(server.url).post("/sign-in?next=/%09/evil.example/x", { email: "nav@example.test", password: "the right password" });
    expect(raw.headers.get("Location")).toBe("/dashboard");
    const inside = await new Client(server.url).post(`/sign-in?next=${encodeURIComponent("/settings/tokens?tab=1")}`, { email: "nav@example.test", password: "the right password" });
    expect(inside.headers.get("Location")).toBe("/settings/tokens?tab=1");
  });

  it("gives a new session id at sign-in and sign-up, ends the old one, and keeps opened view links", async () => {
    const owner = await signUp(server.url, "Fix Owner");
    const { id } = await (await owner.json("/api/v1/mechanisms", "POST", { title: "Fixation check" })).json();
    const { url } = await (await owner.json(`/api/v1/mechanisms/${id}/view-links`, "POST", {})).json();

    // A session planted before sign-up (here by opening a view link signed out).
    const visitor = new Client(server.url);
    await visitor.get(new URL(url).pathname);
    const planted = visitor.cookieHeader;
    expect(planted).toContain("mw_session=");
    const email = `fixation.${Date.now()}@example.test`;
    expect((await visitor.post("/sign-up", { name: "Fix Visitor", email, password: "long enough password" })).status).toBe(302);
    expect(visitor.cookieHeader).not.toBe(planted);
    expect((await new Client(server.url).request("/dashboard", { headers: { Cookie: planted } })).status).toBe(302);
    expect((await visitor.get("/dashboard")).status).toBe(200);
    expect((await visitor.get(`/m/${id}`)).status).toBe(200);

    // Signing in again over a live session replaces it too.
    const before = visitor.cookieHeader;
    expect((await visitor.post("/sign-in", { email, password: "long enough password" })).status).toBe(302);
    expect(visitor.cookieHeader).not.toBe(before);
    expect((await new Client(server.url).request("/dashboard", { headers: { Cookie: before } })).status).toBe(302);
    expect((await visitor.get("/dashboard")).status).toBe(200);
  });
});

describe("the local mailbox", () => {
  it("answers only the demo owner's session: 401 signed out, 404 to anyone else", async () => {
    const signedOut = await fetch(`${server.url}/api/dev/mail`);
    expect(signedOut.status).toBe(401);
    expect(await signedOut.json()).toEqual({ error: expect.any(String), code: "sign_in_required" });

    const someone = await signUp(server.url, "Curious Member");
    expect((await someone.get("/api/dev/mail")).status).toBe(404);
    expect((await someone.get("/dev/mail")).status).toBe(404);

    // Not through an access token either, even the demo owner's own.
    const owner = await demoOwner(server.url);
    const { token } = await (await owner.json("/api/v1/tokens", "POST", { name: "mail script" })).json();
    expect((await fetch(`${server.url}/api/dev/mail`, { headers: { Authorization: `Bearer ${token}` } })).status).toBe(404);

    const read = await owner.get("/api/dev/mail");
    expect(read.status).toBe(200);
    expect((await read.json()).messages.some((m: { to: string }) => m.to === someone.email)).toBe(true);
    expect((await owner.get("/dev/mail")).status).toBe(200);
  });
});

describe("e-mail verification", () => {
  it("lets a new account work at once, but hands it no seat by address until the address is confirmed", async () => {
    const owner = await signUp(server.url, "Seat Owner");
    const { id } = await (await owner.json("/api/v1/mechanisms", "POST", { title: "Guarded seat" })).json();
    // Anyone can sign up with a colleague's address...
    const impostor = await signUpUnconfirmed(server.url, "Impostor");
    expect((await impostor.json("/api/v1/mechanisms", "POST", { title: "My own" })).status).toBe(201);

    // ...but adding that address grants nothing,
    const added = await owner.post(`/m/${id}/members`, { intent: "add", email: impostor.email, role: "editor" });
    expect(added.status).toBe(400);
    expect(await added.text()).toContain("has not confirmed its e-mail address");
    expect((await impostor.get(`/api/v1/mechanisms/${id}`)).status).toBe(404);

    // and an invitation accepted by the unconfirmed account waits for the confirmation.
    await owner.json(`/api/v1/mechanisms/${id}/invitations`, "POST", { email: impostor.email, role: "editor" });
    const invitation = linkIn(await waitForMail(server.url, impostor.email, "Guarded seat"), "/invite/");
    const accepted = await impostor.post(invitation.pathname, { intent: "accept" });
    expect(accepted.status).toBe(302);
    expect(accepted.headers.get("Location")).toBe("/verify-email");
    expect((await impostor.get(`/api/v1/mechanisms/${id}`)).status).toBe(404);
    const waiting = await (await impostor.get("/verify-email")).text();
    expect(waiting).toContain("These seats wait until you confirm your address");
    expect(waiting).toContain("Guarded seat");
    expect(await (await owner.get(`/m/${id}/members`)).text()).toContain("waiting for the address to be confirmed");

    // Only the owner of the mailbox can finish it: the confirmation link grants the seat.
    const confirmed = await confirmAddress(server.url, impostor.email);
    expect(confirmed.status).toBe(200);
    expect(await confirmed.text()).toContain("Guarded seat");
    expect((await (await impostor.get(`/api/v1/mechanisms/${id}`)).json()).role).toBe("editor");
    expect(await (await owner.get(`/m/${id}/members`)).text()).not.toContain("waiting for the address");
  });

  it("mails single-use links that expire after a day; a resend retires the old one", async () => {
    const account = await signUpUnconfirmed(server.url, "Late Confirmer");
    const first = linkIn(await waitForMail(server.url, account.email, VERIFY_SUBJECT), "/verify-email/");
    const [{ lifetime }] = (
      await sql(server, "select extract(epoch from t.expires_at - t.created_at) as lifetime from email_tokens t join users u on u.id = t.user_id where u.email = $1", [account.email])
    ).rows;
    expect(Math.round(Number(lifetime))).toBe(24 * 3600);
    // Only the hash is stored.
    expect((await sql(server, "select count(*)::int as n from email_tokens where token_hash = $1", [first.pathname.split("/").pop()])).rows[0].n).toBe(0);

    const tooSoon = await account.post("/verify-email", {});
    expect(tooSoon.status).toBe(429);
    await sql(server, "update email_tokens set created_at = created_at - interval '2 minutes' where user_id = (select id from users where email = $1)", [account.email]);
    expect((await account.post("/verify-email", {})).status).toBe(200);
    expect((await mailTo(server.url, account.email)).filter((m) => m.subject.includes(VERIFY_SUBJECT))).toHaveLength(2);

    const retired = await new Client(server.url).get(first.pathname);
    expect(retired.status).toBe(404);
    expect(await retired.text()).toContain("a newer one replaced it");

    const second = linkIn(await waitForMail(server.url, account.email, VERIFY_SUBJECT), "/verify-email/");
    expect(second.pathname).not.toBe(first.pathname);
    // Opening the link changes nothing (mail scanners fetch links); the button does.
    expect((await new Client(server.url).get(second.pathname)).status).toBe(200);
    expect(await (await account.get("/verify-email")).text()).toContain("Confirm your e-mail address");
    expect((await new Client(server.url).post(second.pathname, {})).status).toBe(200);
    expect(await (await account.get("/verify-email")).text()).toContain("Your address is confirmed");
    const reused = await new Client(server.url).post(second.pathname, {});
    expect(reused.status).toBe(400);
    expect(await reused.text()).toContain("already used");

    const expiring = await signUpUnconfirmed(server.url, "Too Late");
    const link = linkIn(await waitForMail(server.url, expiring.email, VERIFY_SUBJECT), "/verify-email/");
    await sql(server, "update email_tokens set expires_at = now() - interval '1 second' where user_id = (select id from users where email = $1)", [expiring.email]);
    const expired = await new Client(server.url).post(link.pathname, {});
    expect(expired.status).toBe(400);
    expect(await expired.text()).toContain("expired");
  });

  it("seeds the demo accounts confirmed", async () => {
    const { rows } = await sql(server, "select email from users where email = any($1) and email_verified_at is not null", [demoAccounts.map((a) => a.email)]);
    expect(rows).toHaveLength(demoAccounts.length);
    const editor = await signIn(server.url, demoAccounts[1].email, DEMO_PASSWORD);
    expect(await (await editor.get("/dashboard")).text()).not.toContain("Confirm your e-mail");
  });
});

describe("password reset", () => {
  it("mails an hour-long single-use link without telling who has an account, ends the other sessions and revokes the access tokens", async () => {
    const account = await signUpUnconfirmed(server.url, "Forgetful");
    const elsewhere = await signIn(server.url, account.email, "correct horse battery");
    const { token } = await (await elsewhere.json("/api/v1/tokens", "POST", { name: "lab script" })).json();
    const withToken = () => fetch(`${server.url}/api/v1/mechanisms`, { headers: { Authorization: `Bearer ${token}` } });
    expect((await withToken()).status).toBe(200);

    const known = await new Client(server.url).post("/forgot-password", { email: account.email });
    const unknown = await new Client(server.url).post("/forgot-password", { email: "nobody.here@example.test" });
    expect(known.status).toBe(200);
    expect(unknown.status).toBe(200);
    const answer = (r: string, email: string) => r.match(/If an account uses [^<]*/)![0].replace(email, "ADDRESS");
    expect(answer(await known.text(), account.email)).toBe(answer(await unknown.text(), "nobody.here@example.test"));
    expect((await new Client(server.url).post("/forgot-password", { email: "not an address" })).status).toBe(400);

    const link = linkIn(await waitForMail(server.url, account.email, RESET_SUBJECT), "/reset-password/");
    expect(await mailTo(server.url, "nobody.here@example.test")).toHaveLength(0);
    const [{ lifetime }] = (
      await sql(server, "select extract(epoch from t.expires_at - t.created_at) as lifetime from email_tokens t join users u on u.id = t.user_id where u.email = $1 and t.purpose = 'reset'", [account.email])
    ).rows;
    expect(Math.round(Number(lifetime))).toBe(3600);

    const reader = new Client(server.url);
    expect((await reader.get(link.pathname)).status).toBe(200);
    const short = await reader.post(link.pathname, { password: "short" });
    expect(short.status).toBe(400);
    const reset = await reader.post(link.pathname, { password: "a brand new passphrase" });
    expect(reset.status).toBe(302);
    expect(reset.headers.get("Location")).toBe("/dashboard");
    expect((await reader.get("/dashboard")).status).toBe(200);

    // Every other session is over, every access token revoked; the old password is dead, the new one works.
    expect((await elsewhere.get("/dashboard")).status).toBe(302);
    expect((await withToken()).status).toBe(401);
    expect((await new Client(server.url).post("/sign-in", { email: account.email, password: "correct horse battery" })).status).toBe(401);
    await signIn(server.url, account.email, "a brand new passphrase");
    // The link works once, and it proved the mailbox: the address counts as confirmed.
    expect((await new Client(server.url).get(link.pathname)).status).toBe(404);
    expect((await new Client(server.url).post(link.pathname, { password: "yet another passphrase" })).status).toBe(400);
    expect((await sql(server, "select email_verified_at from users where email = $1", [account.email])).rows[0].email_verified_at).not.toBeNull();
  });

  it("refuses an expired reset link", async () => {
    const account = await signUpUnconfirmed(server.url, "Slow Resetter");
    await new Client(server.url).post("/forgot-password", { email: account.email });
    const link = linkIn(await waitForMail(server.url, account.email, RESET_SUBJECT), "/reset-password/");
    await sql(server, "update email_tokens set expires_at = now() - interval '1 second' where purpose = 'reset' and user_id = (select id from users where email = $1)", [account.email]);
    const expired = await new Client(server.url).get(link.pathname);
    expect(expired.status).toBe(404);
    expect(await expired.text()).toContain("expired");
  });
});

describe("behind a proxy named by TRUST_PROXY", () => {
  let proxied: Server;
  beforeAll(async () => {
    proxied = await startTestServer({ TRUST_PROXY: "loopback" });
  });
  afterAll(() => proxied?.dispose());

  const attempt = (from: string, password: string) =>
    new Client(proxied.url).request("/sign-in", {
      method: "POST",
      headers: { "X-Forwarded-For": from },
      body: new URLSearchParams({ email: "victim@example.test", password }),
    });

  it("throttles (account, address) with growing delays, and the owner's own address still signs in", async () => {
    await new Client(proxied.url).post("/sign-up", { name: "Victim", email: "victim@example.test", password: "the right password" });
    const attacker = "203.0.113.7";
    for (let i = 0; i < 5; i++) expect((await attempt(attacker, `guess ${i}`)).status).toBe(401);
    const first = await attempt(attacker, "the right password");
    expect(first.status).toBe(429);
    // Let the first delay pass (by ageing the failures), fail once more: the next delay is longer.
    await sql(proxied, "update failed_sign_ins set at = at - interval '5 seconds'");
    expect((await attempt(attacker, "guess 5")).status).toBe(401);
    const second = await attempt(attacker, "the right password");
    expect(second.status).toBe(429);
    expect(Number(second.headers.get("Retry-After"))).toBeGreaterThan(Number(first.headers.get("Retry-After")));

    // The owner, from their own address, is not locked out by the stranger's guesses.
    const owner = await attempt("198.51.100.20", "the right password");
    expect(owner.status).toBe(302);
  });
});

describe("with PUBLIC_URL on https", () => {
  let hosted: Server;
  beforeAll(async () => {
    hosted = await startTestServer({ PUBLIC_URL: "https://mechweave.example.test/" });
  });
  afterAll(() => hosted?.dispose());

  it("sends Secure cookies and points every mailed and shared link at the public origin", async () => {
    const client = new Client(hosted.url);
    const response = await client.post("/sign-up", { name: "Public Owner", email: "public.owner@example.test", password: "long enough password" });
    expect(response.headers.getSetCookie().join(";")).toMatch(/;\s*Secure/i);
    expect(linkIn(await waitForMail(hosted.url, "public.owner@example.test", VERIFY_SUBJECT), "/verify-email/").origin).toBe("https://mechweave.example.test");
    await confirmAddress(hosted.url, "public.owner@example.test");

    const { id } = await (await client.json("/api/v1/mechanisms", "POST", { title: "Hosted" })).json();
    await client.request(`/api/v1/mechanisms/${id}/invitations`, {
      method: "POST",
      headers: { "Content-Type": "application/json" },
      body: JSON.stringify({ email: "guest.reader@example.test", role: "viewer" }),
    });
    expect(linkIn(await waitForMail(hosted.url, "guest.reader@example.test", "Hosted"), "/invite/").origin).toBe("https://mechweave.example.test");
    const { url } = await (await client.json(`/api/v1/mechanisms/${id}/view-links`, "POST", {})).json();
    expect(new URL(url).origin).toBe("https://mechweave.example.test");
    await new Client(hosted.url).request("/forgot-password", { method: "POST", body: new URLSearchParams({ email: "public.owner@example.test" }) });
    expect(linkIn(await waitForMail(hosted.url, "public.owner@example.test", RESET_SUBJECT), "/reset-password/").origin).toBe("https://mechweave.example.test");
  });
});
