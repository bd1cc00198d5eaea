// Linkage classes as groups that fold into one box. A large mechanism starts with every class but
// the largest folded, so the first picture is one class drawn at a readable size plus a box per
// other class, each naming its class and size. No reaction joins two classes, so a folded class
// hides no arrow that leaves it.
import type { ComplexGraphReport } from "./graph-model";
import type { Size, XY } from "./layout";

/** From this many steps on, the graph starts with classes folded. */
export const foldFromSteps = 50;

export function startsFolded(report: Pick<ComplexGraphReport, "linkageClasses" | "reactions" | "steps">): Set<number> {
  const stepCount = report.steps?.length ?? report.reactions.length;
  if (stepCount < foldFromSteps || report.linkageClasses.length < 2) return new Set();
  const largest = report.linkageClasses.reduce((best, members, index) => (members.length > report.linkageClasses[best].length ? index : best), 0);
  return new Set(report.linkageClasses.map((_, index) => index).filter((index) => index !== largest));
}

export const classBoxLabel = (classIndex: number, size: number) => `class ${classIndex + 1} · ${size} ${size === 1 ? "complex" : "complexes"}`;

/** A folded class's box: its label's width in the node font, one line high. */
export function estimateClassBoxSize(label: string): Size {
  return { width: Math.round(label.length * 7.2 + 28), height: 34 };
}

/** A folded class sits where its complexes are drawn: at the top-left corner of their box. */
export function classBoxCorner(corners: readonly XY[]): XY {
  if (corners.length === 0) return { x: 0, y: 0 };
  return { x: Math.min(...corners.map(({ x }) => x)), y: Math.min(...corners.map(({ y }) => y)) };
}

/**
 * A class is known by the text of its first complex, not by its number, so a class stays folded
 * while edits elsewhere renumber the classes.
 */
export const classKey = (report: Pick<ComplexGraphReport, "complexes" | "linkageClasses">, classIndex: number) =>
  report.complexes[Math.min(...report.linkageClasses[classIndex])];
