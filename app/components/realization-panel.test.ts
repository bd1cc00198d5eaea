import { readFileSync } from "node:fs";
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { realizeOde } from "~/chem/realize/realize-ode";
import { RealizationPanel } from "./realization-panel";

const lorenz = readFileSync("tests/fixtures/ode/lorenz.ode", "utf8");
const render = async (request: Omit<Parameters<typeof realizeOde>[0], "ode">) =>
  renderToStaticMarkup(
    createElement(RealizationPanel, { ode: lorenz, result: await realizeOde({ ode: lorenz, ...request }), variables: ["x", "y", "z"] }),
  );

describe("RealizationPanel", () => {
  it("marks the written summand behind Lorenz's negative cross effect and offers the suggested shift", async () => {
    const html = await render({});
    expect(html).toContain("<mark");
    expect(html).toMatch(/<mark[^>]*>x\*\(rho - z\)<\/mark>/);
    expect(html).toContain("-x*z");
    expect(html).toContain("suggested from a simulated bounding box");
  });

  it("shows the transformed ODE, the caveat and the canonical mechanism", async () => {
    const html = await render({ shift: "suggested", multiply: true });
    expect(html).toContain("Transformed ODE");
    expect(html).toContain("not proved");
    expect(html).toContain("13 steps, order 5");
  });
});
