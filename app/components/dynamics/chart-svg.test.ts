import { describe, expect, it } from "vitest";
import { chartSvg } from "./chart-svg";
import { seriesLook } from "./palette";

const picture = {
  width: 600,
  height: 300,
  x: { min: 0, max: 0.001, log: false, label: "time", values: [0, 0.0005, 0.001] },
  y: { min: 1e-9, max: 1e-5, log: true, label: "concentration" },
  series: [
    { name: "MQ", values: [2e-6, 1e-6, 5e-7], ...seriesLook(0) },
    { name: "Zr", values: [0, 3e-8, 4e-8], ...seriesLook(12) },
  ],
};

describe("chartSvg", () => {
  const svg = chartSvg(picture, {});

  it("labels the axes with distinct readable ticks and names them", () => {
    for (const label of ["0.0002", "0.0004", "0.001", "10⁻⁹", "10⁻⁷", "10⁻⁵", ">time<", ">concentration<"]) expect(svg).toContain(label);
  });

  it("draws each series in its own look and leaves out values a log axis cannot show", () => {
    expect(svg).toContain(`stroke="${seriesLook(0).colour}" stroke-width="2"/>`);
    expect(svg).toContain(`stroke-dasharray="9 4"`);
    // Zr starts at 0: its line begins at the second sample.
    const zr = svg.match(/<path d="([^"]*)"[^>]*stroke-dasharray/)![1];
    expect(zr.startsWith("M") && zr.split("L").length).toBe(2);
    expect(svg).toContain(">MQ</text>");
    expect(svg).toMatch(/^<svg xmlns="http:\/\/www.w3.org\/2000\/svg" width="600" height="3\d\d"/);
  });
});
