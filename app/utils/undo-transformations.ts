// Maps a realization's simulated course back to the variables and the clock of the original ODE.
// A translation y = x + s is undone by subtracting s; a multiplication of the right-hand side by a
// positive monomial M(y) runs the same orbit on another clock, dt/dτ = M(y(τ)), so the original
// time is recovered by integrating M along the course (trapezoid rule over the samples).
import { compile } from "mathjs";

export interface Transformation {
  kind: "translation" | "multiplication";
  shift?: Record<string, number>;
  monomial?: string;
}

export interface Course {
  t: number[];
  series: Record<string, number[]>;
}

export function undoTransformations(course: Course, variables: readonly string[], transformations: readonly Transformation[]): Course {
  const shift = transformations.find((t) => t.kind === "translation")?.shift ?? {};
  const monomial = transformations.find((t) => t.kind === "multiplication")?.monomial;
  let t = course.t;
  if (monomial) {
    const at = (i: number) => monomialValue(monomial, Object.fromEntries(variables.map((v) => [v, course.series[v][i]])));
    t = [0];
    for (let i = 1; i < course.t.length; i++) t.push(t[i - 1] + 0.5 * (at(i - 1) + at(i)) * (course.t[i] - course.t[i - 1]));
  }
  const series = Object.fromEntries(variables.map((v) => [v, course.series[v].map((y) => y - (shift[v] ?? 0))]));
  return { t, series };
}

export function monomialValue(monomial: string, values: Record<string, number>): number {
  return Number(compile(monomial).evaluate(values));
}
