// Sources: the Lotka–Volterra first integral H = c·x − d·ln x + b·y − a·ln y for
// x' = a x − b x y, y' = c x y − d y (any textbook of mathematical biology); the time-scale
// argument for multiplying by a positive function (e.g. Hirsch, Smale and Devaney, ch. 8–9).
import { describe, expect, it } from "vitest";
import { simulatePolynomialOde } from "../kinetics/simulate";
import { toPolynomialOde } from "./exact";
import { formatOde } from "./format";
import { parseOde } from "./parse";
import * as P from "./polynomial";
import * as Q from "../linalg/rational";
import { multiplyByMonomial, productOfAllVariables, translate } from "./transform";
import { roundUpNicely, shiftFromBox } from "./suggest-shift";

const exact = (text: string) => parseOde(text).exact!;

describe("multiplication by a positive monomial", () => {
  it("keeps the Lotka–Volterra orbits: the first integral stays constant along x*y times the field", () => {
    const ode = exact("x' = 2*x - 0.5*x*y\ny' = 0.5*x*y - 3*y\nx(0) = 4\ny(0) = 2\n");
    const slowed = multiplyByMonomial(ode, productOfAllVariables(ode));
    const { series } = simulatePolynomialOde(toPolynomialOde(slowed), { until: 2, samples: 200, rtol: 1e-10, atol: 1e-12 });
    const h = series.x.map((x, k) => 0.5 * x - 3 * Math.log(x) + 0.5 * series.y[k] - 2 * Math.log(series.y[k]));
    const spread = Math.max(...h) - Math.min(...h);
    expect(spread).toBeLessThan(1e-6);
    expect(Math.max(...series.x) - Math.min(...series.x)).toBeGreaterThan(1); // it did move along the orbit
  });

  it("writes the product into every term", () => {
    const ode = exact("x' = -y\ny' = x\n");
    expect(formatOde(multiplyByMonomial(ode, productOfAllVariables(ode)))).toBe("x' = -x*y^2\ny' = x^2*y\n");
  });
});

describe("translation", () => {
  it("moves the Lorenz trajectory by the shift (compared over a short, non-chaotic interval)", () => {
    const lorenz = "x' = 10*(y - x)\ny' = x*(28 - z) - y\nz' = x*y - 8/3*z\nx(0) = 1\ny(0) = 1\nz(0) = 1\n";
    const shift = [21, 28, 4];
    const moved = translate(exact(lorenz), shift.map((s) => Q.rational(s)));
    const options = { until: 1, samples: 11, rtol: 1e-10, atol: 1e-10 };
    const a = simulatePolynomialOde(toPolynomialOde(exact(lorenz)), options).series;
    const b = simulatePolynomialOde(toPolynomialOde(moved), options).series;
    ["x", "y", "z"].forEach((v, i) => a[v].forEach((value, k) => expect(b[v][k] - shift[i]).toBeCloseTo(value, 5)));
  });

  it("substitutes exactly: x' = x^2 under x → x + 3/2 becomes x^2 - 3x + 9/4", () => {
    const moved = translate(exact("x' = x^2\n"), [Q.rational(3, 2)]);
    expect(P.equals(moved.rhs[0], exact("x' = x^2 - 3*x + 9/4\n").rhs[0])).toBe(true);
  });
});

describe("suggested shift", () => {
  it("puts each observed minimum a tenth of the range above zero, rounded up to two digits", () => {
    const shift = shiftFromBox({ x: { min: -17.03, max: 19.55 }, y: { min: 2, max: 8 }, z: { min: 0, max: 0 } }, ["x", "y", "z"]);
    expect(shift.map(Q.toText)).toEqual(["21", "0", "1"]);
    expect(Q.toText(roundUpNicely(0.0123))).toBe("13/1000");
  });
});
