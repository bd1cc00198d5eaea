// From an analysis report to what the complex graph draws: one node per complex, one edge per
// reaction, each tagged with its linkage class, terminal strong linkage class and pairing.
import type { StepSummary } from "~/chem/analysis";
import { readableNumberText } from "~/chem/numbers";

/** The parts of an analysis report the graph reads (the `analyze` JSON has them all). */
export interface ComplexGraphReport {
  /** Canonical complex text, e.g. "X + 2Y" or "0". */
  complexes: string[];
  reactions: { from: number; to: number; rate?: number | null; coefficient?: string | null }[];
  linkageClasses: number[][];
  terminalStrongLinkageClasses: number[][];
  /** External species held constant, with their concentrations. */
  fixedSpecies?: Record<string, number>;
  /** Non-fixed species; with `steps`, what the species–step view, search and caret read. */
  species?: string[];
  steps?: StepSummary[];
}

export interface ComplexNodeModel {
  /** Canonical text: the node id and the key of its position in the shared layout. */
  key: string;
  index: number;
  label: string;
  linkageClass: number;
  terminal: boolean;
  /** Said by screen readers and shown on hover. */
  description: string;
}

export interface ReactionEdgeModel {
  id: string;
  index: number;
  source: string;
  target: string;
  /** +1 when the reverse reaction is drawn too: each of the pair bows to its own left. */
  bend: 0 | 1;
  label: string | null;
  description: string;
}

export interface GraphModel {
  nodes: ComplexNodeModel[];
  edges: ReactionEdgeModel[];
  linkageClassCount: number;
}

/** The zero complex is written 0 in the text and drawn as the empty-set sign. */
export const complexLabel = (text: string) => (text === "0" ? "∅" : text);

export function buildGraphModel(report: ComplexGraphReport): GraphModel {
  const classOf = membership(report.linkageClasses);
  const terminal = new Set(report.terminalStrongLinkageClasses.flat());
  const nodes = report.complexes.map((text, index) => {
    const linkageClass = classOf.get(index) ?? report.linkageClasses.length;
    const isTerminal = terminal.has(index);
    const description = `Complex ${complexLabel(text)}, linkage class ${linkageClass + 1}${isTerminal ? ", terminal" : ""}`;
    return { key: text, index, label: complexLabel(text), linkageClass, terminal: isTerminal, description };
  });
  const directed = new Set(report.reactions.map(({ from, to }) => `${from}>${to}`));
  const edges = report.reactions.map(({ from, to, rate, coefficient }, index) => {
    const label = coefficient ?? (rate == null ? null : rateText(rate));
    const [source, target] = [report.complexes[from], report.complexes[to]];
    return {
      id: `${source} → ${target}`,
      index,
      source,
      target,
      bend: directed.has(`${to}>${from}`) ? (1 as const) : (0 as const),
      label,
      description: `Reaction ${complexLabel(source)} to ${complexLabel(target)}${label ? `, rate coefficient ${label}` : ""}`,
    };
  });
  return { nodes, edges, linkageClassCount: report.linkageClasses.length };
}

/** Equal for two reports that draw the same graph: the fields above, and nothing else of the analysis. */
export function graphKey(report: ComplexGraphReport | null): string {
  if (!report) return "";
  const { complexes, reactions, linkageClasses, terminalStrongLinkageClasses, fixedSpecies, species, steps } = report;
  return JSON.stringify([complexes, reactions, linkageClasses, terminalStrongLinkageClasses, fixedSpecies, species, steps]);
}

/** A rate coefficient beside an arrow, written as the typeset equations write it (3 significant digits, a×10ⁿ outside 10⁻³…10⁵). */
export function rateText(rate: number): string {
  return readableNumberText(rate, 3);
}

function membership(classes: number[][]): Map<number, number> {
  const classOf = new Map<number, number>();
  classes.forEach((members, classIndex) => members.forEach((member) => classOf.set(member, classIndex)));
  return classOf;
}
