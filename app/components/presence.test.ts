import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { initials, Presence } from "./presence";

describe("initials", () => {
  it("take the first and last word's first letters", () => {
    expect(initials("Ada Quill")).toBe("AQ");
    expect(initials("  maria de la Vega ")).toBe("MV");
  });

  it("take two letters of a single name and survive an empty one", () => {
    expect(initials("Ondine")).toBe("ON");
    expect(initials("")).toBe("?");
    expect(initials("Ève")).toBe("ÈV");
  });
});

describe("presence", () => {
  const self = { name: "Ada Quill", colour: "#236cc1", role: "editor" as const };
  const render = (peers: Parameters<typeof Presence>[0]["peers"], max?: number) =>
    renderToStaticMarkup(createElement(Presence, { self, peers, max }));

  it("counts people once however many tabs they have open, and says how many only watch", () => {
    const markup = render([
      { clientId: 2, name: "Bram Okafor", colour: "#b94548", role: "owner" },
      { clientId: 3, name: "Cleo Marr", colour: "#3a7a2c", role: "viewer" },
      { clientId: 4, name: "Cleo Marr", colour: "#3a7a2c", role: "viewer" },
      { clientId: 5, name: "Ada Quill", colour: "#236cc1", role: "editor" },
    ]);
    expect(markup).toContain("3 here · 1 viewing");
    expect(markup).toContain("Ada Quill (you), editor");
    expect(markup).toContain("Cleo Marr, viewer");
  });

  it("collapses people beyond the limit into a count", () => {
    const peers = ["Bo", "Cy", "Di", "Ed"].map((name, index) => ({
      clientId: index + 2,
      name,
      colour: "#715cc0",
      role: "viewer" as const,
    }));
    expect(render(peers, 3)).toContain("+2");
  });

  it("says so when you are alone", () => {
    const markup = render([]);
    expect(markup).toContain("only you");
    expect(markup).not.toContain("viewing");
  });
});
