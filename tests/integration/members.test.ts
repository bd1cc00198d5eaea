import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { signUp } from "../support/http";
import { startTestServer } from "../support/server";

let server: Awaited<ReturnType<typeof startTestServer>>;
beforeAll(async () => {
  server = await startTestServer();
});
afterAll(() => server?.dispose());

describe("members and roles", () => {
  it("adds, changes, removes members and transfers ownership, with an audit trail", async () => {
    const owner = await signUp(server.url, "Maya Owner");
    const colleague = await signUp(server.url, "Colleague");
    const { id } = await (await owner.json("/api/v1/mechanisms", "POST", { title: "Shared" })).json();
    const role = async (client: typeof owner) => (await (await client.get(`/api/v1/mechanisms/${id}`)).json()).role;

    expect((await owner.post(`/m/${id}/members`, { intent: "add", email: colleague.email, role: "viewer" })).status).toBe(200);
    expect(await role(colleague)).toBe("viewer");
    const again = await owner.post(`/m/${id}/members`, { intent: "add", email: colleague.email, role: "editor" });
    expect(again.status).toBe(400);

    const members = await owner.get(`/m/${id}/members`);
    const userId = (await members.text()).match(/name="userId" value="([0-9a-f-]{36})"/)![1];
    await owner.post(`/m/${id}/members`, { intent: "change", userId, role: "editor" });
    expect(await role(colleague)).toBe("editor");

    await owner.post(`/m/${id}/members`, { intent: "transfer", userId });
    expect(await role(colleague)).toBe("owner");
    expect(await role(owner)).toBe("editor");
    expect((await owner.post(`/m/${id}/members`, { intent: "remove", userId })).status).toBe(403);

    const page = await (await colleague.get(`/m/${id}/members`)).text();
    expect(page).toContain("made owner");
    expect(page).toContain("added");
  });

  it("refuses to add an address without an account", async () => {
    const owner = await signUp(server.url, "Solo Owner");
    const { id } = await (await owner.json("/api/v1/mechanisms", "POST", { title: "Alone" })).json();
    const response = await owner.post(`/m/${id}/members`, { intent: "add", email: "ghost@example.test", role: "editor" });
    expect(response.status).toBe(400);
    expect(await response.text()).toContain("No account uses ghost@example.test");
  });
});
