// The typed result of reading a `.weave` text: what the author wrote, before any network theory.
// Shared by the browser (editor diagnostics), the server and the CLI.

export type Severity = "error" | "warning";

export interface Diagnostic {
  severity: Severity;
  /** 1-based line and column of the start of the offending text. */
  line: number;
  column: number;
  message: string;
  /** Character offsets into the source, for editor underlines. */
  from: number;
  to: number;
}

export interface Term {
  coefficient: number;
  species: string;
}

/**
 * Arithmetic of numbers and parameters that gives a mass-action rate coefficient, such as
 * `2.0e6 * T^0.5 * exp(-6000 / T)`. Parentheses are implied by the tree.
 */
export type RateExpression =
  | { kind: "number"; value: number }
  | { kind: "parameter"; name: string }
  | { kind: "negate"; operand: RateExpression }
  | { kind: "binary"; operator: "+" | "-" | "*" | "/" | "^"; left: RateExpression; right: RateExpression }
  | { kind: "call"; name: RateFunction; argument: RateExpression };

export type RateFunction = "exp" | "log" | "sqrt";

/** A rate coefficient as written: a literal number, a parameter name, or an expression of both. */
export type RateRef =
  | { kind: "value"; value: number }
  | { kind: "parameter"; name: string }
  | { kind: "expression"; expression: RateExpression };

export interface Step {
  label: string | null;
  /** Terms as written, fixed species included; the network drops those. */
  reactants: Term[];
  products: Term[];
  reversible: boolean;
  /** null when the author gave no rate coefficient (a warning, not an error). */
  forward: RateRef | null;
  backward: RateRef | null;
  /** A custom rate law in mathjs syntax (irreversible steps only); null for mass action. */
  law: string | null;
  line: number;
  from: number;
  to: number;
}

export interface Mechanism {
  steps: Step[];
  /** Non-fixed species, in order of first appearance. */
  species: string[];
  /** External species held constant, with their concentrations. */
  fixed: Record<string, number>;
  parameters: Record<string, number>;
  /** Initial concentrations that were given; every other species starts at 0. */
  initial: Record<string, number>;
  /**
   * Present when the text says `balanced`: each step is checked for atoms and charge, with the
   * formulas declared for species whose names are not formulas (`formula [Glc] = C6H12O6`).
   */
  elementBalance?: { formulas: Record<string, string> };
}

export interface ParseResult {
  mechanism: Mechanism;
  diagnostics: Diagnostic[];
}

/** A complex as species indices with positive integer coefficients, sorted by species index. */
export interface ComplexVector {
  text: string;
  terms: { species: number; coefficient: number }[];
}

/** A directed reaction between complexes (a reversible step gives two; duplicates merged). */
export interface Reaction {
  from: number;
  to: number;
  /** Effective mass-action coefficient with fixed species folded in; null if not given or custom. */
  rate: number | null;
  /** Custom rate law (mathjs syntax) or null for mass action. */
  law: string | null;
  /**
   * The mass-action rate coefficient as written, a sum (merged duplicates) of products of factors:
   * [[k1, A^2]] for `@ k1` with fixed [A] consumed twice. Null exactly when `law` is set.
   */
  coefficient: RateFactor[][] | null;
  /** Indices into Mechanism.steps this reaction came from. */
  steps: number[];
}

/** One factor of a mass-action rate coefficient as the author wrote it. */
export interface RateFactor {
  /** "value": a literal number; "missing": a stand-in name for a coefficient not given yet. */
  kind: "parameter" | "value" | "fixed" | "missing" | "expression";
  /** The parameter, fixed species or stand-in name, the number's text, or the expression's text. */
  symbol: string;
  power: number;
  /** Kind "expression" only: the tree, and its value at the parameters given (null: it has none). */
  expression?: { tree: RateExpression; value: number | null };
}

export interface Network {
  species: string[];
  complexes: ComplexVector[];
  reactions: Reaction[];
}

/** One term of a polynomial: coefficient times the product of variables to the given powers. */
export interface Monomial {
  coefficient: number;
  /** One exponent per variable, in the order of PolynomialOde.variables. */
  exponents: number[];
}

/** A polynomial ODE x' = P(x) with parameters already substituted (from a `.ode` file). */
export interface PolynomialOde {
  variables: string[];
  /** rhs[i] is the right-hand side of variables[i]. */
  rhs: Monomial[][];
  /** Initial values, 0 where none was given. */
  initial: number[];
}
