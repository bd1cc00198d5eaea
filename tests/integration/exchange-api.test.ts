// SBML, LaTeX and CSV through the API: export, import, and refusal of bad files.
import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { demoMechanisms } from "../../server/seed/demo";
import { signUp } from "../support/http";
import { startTestServer } from "../support/server";

let server: Awaited<ReturnType<typeof startTestServer>>;
let owner: Awaited<ReturnType<typeof signUp>>;
beforeAll(async () => {
  server = await startTestServer();
  owner = await signUp(server.url, "Exchange Owner");
});
afterAll(() => server?.dispose());

async function analysisOf(id: string) {
  return (await (await owner.get(`/api/v1/mechanisms/${id}`)).json()).analysis;
}

describe("exchange", () => {
  it("exports every demo mechanism to SBML and imports it back to the same network and ODEs", async () => {
    for (const demo of demoMechanisms) {
      const { id } = await (await owner.json("/api/v1/mechanisms", "POST", { title: demo.title, source: demo.source })).json();
      const exported = await owner.get(`/api/v1/mechanisms/${id}/export?format=sbml`);
      expect(exported.status).toBe(200);
      expect(exported.headers.get("Content-Type")).toContain("sbml");
      const xml = await exported.text();
      const form = new FormData();
      form.set("file", new File([xml], "model.xml", { type: "application/xml" }));
      const imported = await owner.request("/api/v1/mechanisms/import", { method: "POST", body: form });
      expect(imported.status).toBe(201);
      const copy = await imported.json();
      const [before, after] = await Promise.all([analysisOf(id), analysisOf(copy.id)]);
      expect(after.complexes).toEqual(before.complexes);
      expect(after.reactions).toEqual(before.reactions);
      expect(after.deficiency).toBe(before.deficiency);
      expect(Object.keys(after.odes)).toEqual(Object.keys(before.odes));
    }
  });

  it("imports a raw SBML body written by hand from a textbook model", async () => {
    const xml = readFileSync(path.join(import.meta.dirname, "../fixtures/sbml", readdirSync(path.join(import.meta.dirname, "../fixtures/sbml")).filter((f) => f.endsWith(".xml"))[0]), "utf8");
    const response = await owner.request("/api/v1/mechanisms/import", { method: "POST", headers: { "Content-Type": "application/xml" }, body: xml });
    expect(response.status).toBe(201);
  });

  it("refuses files that are not SBML and creates nothing", async () => {
    const before = (await (await owner.get("/api/v1/mechanisms")).json()).mechanisms.length;
    const notXml = await owner.request("/api/v1/mechanisms/import", { method: "POST", headers: { "Content-Type": "application/xml" }, body: "hello" });
    expect(notXml.status).toBe(400);
    expect(await notXml.json()).toEqual({ error: expect.stringContaining("SBML"), code: "bad_input" });
    const big = await owner.request("/api/v1/mechanisms/import", { method: "POST", headers: { "Content-Type": "application/xml" }, body: "<a>" + "x".repeat(5 * 1024 * 1024) + "</a>" });
    expect(big.status).toBe(413);
    expect((await (await owner.get("/api/v1/mechanisms")).json()).mechanisms.length).toBe(before);
  });

  it("exports LaTeX and the stoichiometric matrix", async () => {
    const { id } = await (await owner.json("/api/v1/mechanisms", "POST", { title: "Small", source: "A + B <=> C @ 1, 2\n" })).json();
    const latex = await (await owner.get(`/api/v1/mechanisms/${id}/export?format=latex`)).text();
    expect(latex).toContain("\\begin{document}");
    expect(latex).toContain("\\end{document}");
    const csv = await (await owner.get(`/api/v1/mechanisms/${id}/export?format=csv`)).text();
    expect(csv.split("\n")[1]).toMatch(/^A,-1,1/);
    expect((await owner.get(`/api/v1/mechanisms/${id}/export?format=pdf`)).status).toBe(400);
  });
});

