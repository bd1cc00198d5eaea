// Conditions on the rate coefficients of a reversible mass-action network for detailed balance
// (Feinberg 1989): one circuit condition for each independent cycle of the undirected complex
// graph (the Wegscheider-type conditions), and one spanning-forest condition for each linear
// dependency among the reaction vectors of a spanning forest. Together r/2 − s conditions.
import { coefficientLatex, coefficientText } from "./expression";
import { ExactSizeLimitError } from "./linalg/fraction-free";
import { sparseNullSpace } from "./linalg/kernel";
import type { SparseVector } from "./linalg/sparse";
import type { Network } from "./model";
import { reactionVector } from "./network";

export interface BalanceCondition {
  text: string;
  latex: string;
  /** Whether the given numbers satisfy it; null when some coefficient has no numeric value. */
  satisfied: boolean | null;
}

export interface DetailedBalance {
  /** Only reversible networks with mass-action rates can be detailed balanced. */
  applicable: boolean;
  note: string;
  circuitConditions: BalanceCondition[];
  spanningForestConditions: BalanceCondition[];
  /** All conditions hold for the given coefficients; null if not applicable or not all known. */
  satisfied: boolean | null;
}

/** A reaction raised to a power, on one side of a condition. */
interface Power {
  reaction: number;
  power: number;
}

interface Pair {
  forward: number;
  backward: number;
  a: number;
  b: number;
}

export function detailedBalance(network: Network, reversible: boolean): DetailedBalance {
  const none = (note: string): DetailedBalance => ({
    applicable: false,
    note,
    circuitConditions: [],
    spanningForestConditions: [],
    satisfied: null,
  });
  if (network.reactions.length === 0) return none("There are no reactions yet.");
  if (!reversible) return none("Detailed balance needs every reaction to have its reverse; this network is not reversible.");
  if (network.reactions.some((reaction) => reaction.law !== null)) {
    return none("Detailed balance conditions are stated for mass-action rates; some reactions use a custom rate law.");
  }

  const pairs = reactionPairs(network);
  const { treePairs, cycles } = spanningForest(network.complexes.length, pairs);
  const circuitConditions = cycles.map((cycle) => condition(network, cycle.left, cycle.right));
  let dependencies: { left: Power[]; right: Power[] }[];
  try {
    dependencies = forestDependencies(network, treePairs.map((index) => pairs[index]));
  } catch (error) {
    // Exponents of hundreds of digits state nothing a reader could check: say so, keep the rest.
    if (!(error instanceof ExactSizeLimitError)) throw error;
    return {
      applicable: true,
      note: "The dependencies among the reaction vectors have exponents too large to state exactly, so the spanning-forest conditions are not listed.",
      circuitConditions,
      spanningForestConditions: [],
      satisfied: null,
    };
  }
  const spanningForestConditions = dependencies.map(({ left, right }) => condition(network, left, right));
  const all = [...circuitConditions, ...spanningForestConditions];
  const satisfied = all.some((entry) => entry.satisfied === null) ? null : all.every((entry) => entry.satisfied);
  const count = all.length;
  const note =
    count === 0
      ? "Every choice of rate coefficients gives detailed balance: there are no cycles and no dependencies among the reaction vectors."
      : count === 1
        ? "Detailed balance holds exactly when this condition on the rate coefficients holds."
        : `Detailed balance holds exactly when these ${count} conditions on the rate coefficients hold.`;
  return { applicable: true, note, circuitConditions, spanningForestConditions, satisfied };
}

function reactionPairs(network: Network): Pair[] {
  const byEnds = new Map<string, number>();
  network.reactions.forEach((reaction, index) => byEnds.set(`${reaction.from}>${reaction.to}`, index));
  const pairs: Pair[] = [];
  network.reactions.forEach((reaction, index) => {
    const backward = byEnds.get(`${reaction.to}>${reaction.from}`)!;
    if (index < backward) pairs.push({ forward: index, backward, a: reaction.from, b: reaction.to });
  });
  return pairs;
}

/** Breadth-first spanning forest (short cycles read best) and the fundamental cycle of each other pair. */
function spanningForest(complexCount: number, pairs: Pair[]): { treePairs: number[]; cycles: { left: Power[]; right: Power[] }[] } {
  const neighbours: { pair: number; other: number }[][] = Array.from({ length: complexCount }, () => []);
  pairs.forEach((pair, index) => {
    neighbours[pair.a].push({ pair: index, other: pair.b });
    neighbours[pair.b].push({ pair: index, other: pair.a });
  });
  const parentPair = new Array<number>(complexCount).fill(-1);
  const parent = new Array<number>(complexCount).fill(-1);
  const depth = new Array<number>(complexCount).fill(-1);
  const inTree = new Array<boolean>(pairs.length).fill(false);
  for (let root = 0; root < complexCount; root++) {
    if (depth[root] !== -1) continue;
    depth[root] = 0;
    const queue = [root];
    for (let head = 0; head < queue.length; head++) {
      const node = queue[head];
      for (const { pair, other } of neighbours[node]) {
        if (depth[other] !== -1) continue;
        depth[other] = depth[node] + 1;
        parent[other] = node;
        parentPair[other] = pair;
        inTree[pair] = true;
        queue.push(other);
      }
    }
  }
  const traverse = (from: number, to: number, pair: Pair, into: { left: Power[]; right: Power[] }) => {
    const forward = pair.a === from && pair.b === to;
    into.left.push({ reaction: forward ? pair.forward : pair.backward, power: 1 });
    into.right.push({ reaction: forward ? pair.backward : pair.forward, power: 1 });
  };
  const cycles = pairs
    .map((pair, index) => ({ pair, index }))
    .filter(({ index }) => !inTree[index])
    .map(({ pair }) => {
      const cycle = { left: [] as Power[], right: [] as Power[] };
      traverse(pair.a, pair.b, pair, cycle);
      // Walk b up and a up to their common ancestor; the a-side is walked backwards (down).
      const down: [number, number][] = [];
      let x = pair.b;
      let y = pair.a;
      while (x !== y) {
        if (depth[x] >= depth[y]) {
          traverse(x, parent[x], pairs[parentPair[x]], cycle);
          x = parent[x];
        } else {
          down.push([parent[y], y]);
          y = parent[y];
        }
      }
      for (const [from, to] of down.reverse()) {
        const pairIndex = parentPair[to];
        traverse(from, to, pairs[pairIndex], cycle);
      }
      return cycle;
    });
  return { treePairs: pairs.map((_, index) => index).filter((index) => inTree[index]), cycles };
}

/** Each integer dependency Σ α_e (y_b − y_a) = 0 among tree reaction vectors gives Π κ_e^α_e = 1. */
function forestDependencies(network: Network, tree: Pair[]): { left: Power[]; right: Power[] }[] {
  // The transpose of the tree's reaction vectors: one row per species, edges ascending.
  const rows: SparseVector[] = network.species.map(() => ({ indices: [], values: [] }));
  tree.forEach((pair, edge) => {
    const { indices, values } = reactionVector(network, { from: pair.a, to: pair.b });
    indices.forEach((species, k) => {
      rows[species].indices.push(edge);
      rows[species].values.push(values[k]);
    });
  });
  return sparseNullSpace(rows, tree.length).map((alpha) => {
    const left: Power[] = [];
    const right: Power[] = [];
    alpha.indices.forEach((edge, k) => {
      const power = alpha.values[k];
      const { forward, backward } = tree[edge];
      left.push({ reaction: power > 0 ? forward : backward, power: Math.abs(power) });
      right.push({ reaction: power > 0 ? backward : forward, power: Math.abs(power) });
    });
    return { left, right };
  });
}

function condition(network: Network, left: Power[], right: Power[]): BalanceCondition {
  const side = (powers: Power[], notation: "text" | "latex") =>
    [...powers]
      .sort((a, b) => a.reaction - b.reaction)
      .map(({ reaction, power }) => {
        const sum = network.reactions[reaction].coefficient!;
        const base = notation === "text" ? coefficientText(sum) : coefficientLatex(sum);
        // A sum always needs parentheses inside a product; a product only when raised to a power.
        const grouped = sum.length > 1 || (power > 1 && sum[0].length > 1);
        const wrapped = grouped ? (notation === "text" ? `(${base})` : `\\left(${base}\\right)`) : base;
        if (power === 1) return wrapped;
        return notation === "text" ? `${wrapped}^${power}` : `${wrapped}^{${power}}`;
      })
      .join(notation === "text" ? "*" : " ");
  return {
    text: `${side(left, "text")} = ${side(right, "text")}`,
    latex: `${side(left, "latex")} = ${side(right, "latex")}`,
    satisfied: holds(network, left, right),
  };
}

function holds(network: Network, left: Power[], right: Power[]): boolean | null {
  const logSum = (powers: Power[]) => {
    let total = 0;
    for (const { reaction, power } of powers) {
      const rate = network.reactions[reaction].rate;
      if (rate === null || rate <= 0) return null;
      total += power * Math.log(rate);
    }
    return total;
  };
  const a = logSum(left);
  const b = logSum(right);
  if (a === null || b === null) return null;
  // The coefficients are measured decimals, so equality is judged to a relative 1e-9.
  return Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(a) + Math.abs(b));
}
