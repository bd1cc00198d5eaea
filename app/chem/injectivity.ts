// The injectivity (determinant) criterion for mass-action networks: Craciun and Feinberg (2005,
// SIAM J. Appl. Math. 65) without conservation laws, Wiuf and Feliu (2013, SIAM J. Appl. Dyn.
// Syst. 12) with them. Replace the Jacobian's rows at the leading species of the conservation laws
// (in echelon form) by the laws themselves; its determinant is a polynomial in the rate
// coefficients κ and concentrations x. If every coefficient has one sign, the map is injective on
// every compatibility class and no class holds two positive steady states.
//
// The expansion needs no symbolic algebra. With J = N diag(κ x^y) Yᵀ diag(1/x), multilinearity in
// the rows (Cauchy–Binet) and in the columns gives one term per set R of s reactions and set J of
// s species (s the rank): κ^R · x^(Σ_{r∈R} y_r − e_J) times
//   det N[I, R] · det Y[R, J] · det W[:, not J] · (−1)^(Σ pivot rows + Σ columns not in J),
// with I the rows kept. Distinct (R, J) give distinct monomials, so no two terms cancel and the
// signs of these products are the signs of the polynomial's coefficients.
import { MAX_DETERMINANT_TERMS } from "./limits";
import type { Network } from "./model";
import { reactionVector } from "./network";

export interface DeterminantTerm {
  /** Reaction indices R. */
  reactions: number[];
  /** Species indices J, whose concentration divides the monomial. */
  species: number[];
  coefficient: number;
}

export type DeterminantSigns =
  | { kind: "too-large"; terms: number }
  | {
      kind: "expanded";
      /** How many nonzero terms of each sign; both 0 means the determinant is identically 0. */
      positive: number;
      negative: number;
      /** One term of each sign that occurs, to show. */
      examples: DeterminantTerm[];
      /** (−1)^rank: the sign every term has for an injective network (Wiuf–Feliu). */
      expectedSign: 1 | -1;
      /** Species whose rows hold conservation laws. */
      pivots: number[];
    };

/**
 * The sign pattern of the determinant. `laws` must be the conservation-law basis in echelon form
 * (each law's first nonzero entry on a distinct, increasing species), as `nullSpace` gives it.
 */
export function determinantSigns(network: Network, laws: number[][], termLimit = MAX_DETERMINANT_TERMS): DeterminantSigns {
  const n = network.species.length;
  const rank = n - laws.length;
  const termCount = binomial(network.reactions.length, rank) * binomial(n, rank);
  if (termCount > termLimit) return { kind: "too-large", terms: termCount };
  let positive = 0;
  let negative = 0;
  const examples: DeterminantTerm[] = [];
  for (const term of determinantTerms(network, laws)) {
    if (term.coefficient > 0 && positive++ === 0) examples.push(term);
    if (term.coefficient < 0 && negative++ === 0) examples.push(term);
  }
  return { kind: "expanded", positive, negative, examples, expectedSign: rank % 2 === 0 ? 1 : -1, pivots: pivotsOf(laws) };
}

/** Every nonzero term of the determinant, each a distinct monomial κ^R · x^(Σ_{r∈R} y_r − e_J). */
export function* determinantTerms(network: Network, laws: number[][]): Generator<DeterminantTerm> {
  const n = network.species.length;
  const rank = n - laws.length;
  const pivots = pivotsOf(laws);
  const kept = range(n).filter((species) => !pivots.includes(species));
  const stoichiometry = network.reactions.map((reaction) => {
    const { indices, values } = reactionVector(network, reaction);
    return dense(indices, values, n);
  });
  const reactants = network.reactions.map(({ from }) => {
    const row = new Array<number>(n).fill(0);
    for (const { species, coefficient } of network.complexes[from].terms) row[species] = coefficient;
    return row;
  });
  const pivotParity = pivots.reduce((sum, row) => sum + row, 0);

  // det W[:, not J] with its Laplace sign, once per species set J.
  const speciesSets = [...combinations(n, rank)].flatMap((columns) => {
    const others = range(n).filter((column) => !columns.includes(column));
    const minor = integerDeterminant(laws.map((law) => others.map((column) => law[column])));
    if (minor === 0) return [];
    const parity = pivotParity + others.reduce((sum, column) => sum + column, 0);
    return [{ columns, factor: parity % 2 === 0 ? minor : -minor }];
  });

  for (const reactions of combinations(network.reactions.length, rank)) {
    const flux = integerDeterminant(kept.map((species) => reactions.map((reaction) => stoichiometry[reaction][species])));
    if (flux === 0) continue;
    for (const { columns, factor } of speciesSets) {
      const orders = integerDeterminant(reactions.map((reaction) => columns.map((column) => reactants[reaction][column])));
      if (orders !== 0) yield { reactions, species: columns, coefficient: flux * orders * factor };
    }
  }
}

function pivotsOf(laws: number[][]): number[] {
  return laws.map((law) => law.findIndex((weight) => weight !== 0));
}

/** The determinant as a numeric matrix at given coefficients and concentrations: for the witness search and the tests. */
export function determinantMatrix(network: Network, laws: number[][], rates: number[], concentrations: number[]): number[][] {
  const n = network.species.length;
  const pivots = pivotsOf(laws);
  const matrix = range(n).map(() => new Array<number>(n).fill(0));
  network.reactions.forEach((reaction, r) => {
    const reactant = network.complexes[reaction.from].terms;
    const rate = reactant.reduce((product, { species, coefficient }) => product * concentrations[species] ** coefficient, rates[r]);
    const change = reactionVector(network, reaction);
    change.indices.forEach((row, k) => {
      for (const { species, coefficient } of reactant) matrix[row][species] += change.values[k] * coefficient * (rate / concentrations[species]);
    });
  });
  pivots.forEach((row, k) => (matrix[row] = [...laws[k]]));
  return matrix;
}

/** Exact determinant of a small integer matrix by Bareiss's fraction-free elimination. */
export function integerDeterminant(matrix: number[][]): number {
  const size = matrix.length;
  if (size === 0) return 1;
  const a = matrix.map((row) => [...row]);
  let sign = 1;
  let previous = 1;
  for (let k = 0; k < size - 1; k++) {
    if (a[k][k] === 0) {
      const swap = a.findIndex((row, i) => i > k && row[k] !== 0);
      if (swap < 0) return 0;
      [a[k], a[swap]] = [a[swap], a[k]];
      sign = -sign;
    }
    for (let i = k + 1; i < size; i++) {
      for (let j = k + 1; j < size; j++) {
        a[i][j] = (a[i][j] * a[k][k] - a[i][k] * a[k][j]) / previous;
        if (!Number.isSafeInteger(a[i][j])) throw new RangeError("determinant entries beyond 2^53");
      }
    }
    previous = a[k][k];
  }
  return sign * a[size - 1][size - 1];
}

function dense(indices: number[], values: number[], width: number): number[] {
  const row = new Array<number>(width).fill(0);
  indices.forEach((index, k) => (row[index] = values[k]));
  return row;
}

function range(n: number): number[] {
  return Array.from({ length: n }, (_, i) => i);
}

function binomial(n: number, k: number): number {
  if (k < 0 || k > n) return 0;
  let result = 1;
  for (let i = 1; i <= Math.min(k, n - k); i++) result = (result * (n - Math.min(k, n - k) + i)) / i;
  return Math.round(result);
}

/** Every k-subset of 0 … n−1, in lexicographic order. */
function* combinations(n: number, k: number): Generator<number[]> {
  const chosen = range(k);
  if (k > n) return;
  while (true) {
    yield [...chosen];
    let i = k - 1;
    while (i >= 0 && chosen[i] === n - k + i) i--;
    if (i < 0) return;
    chosen[i]++;
    for (let j = i + 1; j < k; j++) chosen[j] = chosen[j - 1] + 1;
  }
}
