// Sources: Szederkényi (2010), "Computing sparse and dense realizations of reaction kinetic systems",
// J. Math. Chem. 47 — the MILP formulation and the facts that the dense realization contains every
// realization on the same complexes and that a sparse one has the fewest reactions. Feinberg (1987),
// "Chemical reaction network structure and the stability of complex isothermal reactors I", for the
// deficiency-zero network A ⇌ 2B, A + C ⇌ D ⇌ B + E. Lotka (1920) / Volterra (1926) for the
// predator–prey scheme X → 2X, X + Y → 2Y, Y → 0.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { odeArbitrary } from "../ode/arbitrary";
import { canonicalRealization } from "./canonical";
import { parseOde } from "../ode/parse";
import * as Q from "../linalg/rational";
import type { MassActionMechanism } from "./mass-action";
import { inducedRhs } from "./mass-action";
import { searchRealization } from "./milp";
import { problemOnComplexes, realizationProblem } from "./problem";
import { searchWeaklyReversible, strongComponentOf } from "./weakly-reversible";
import { mechanismText } from "./weave-text";

const deadline = () => Date.now() + 20_000;
/** The steps without their rates, sorted: the graph of a realization. */
const steps = (m: MassActionMechanism) =>
  mechanismText(m, "").split("\n").slice(1, -1).map((line) => line.replace(/ @ .*/, "")).sort();

// Feinberg's network over A, B, C, D, E with invented rate coefficients.
const v = (a: number, b: number, c: number, d: number, e: number) => [a, b, c, d, e];
const feinberg: MassActionMechanism = {
  species: ["A", "B", "C", "D", "E"],
  reactions: [
    [v(1, 0, 0, 0, 0), v(0, 2, 0, 0, 0), 2],
    [v(0, 2, 0, 0, 0), v(1, 0, 0, 0, 0), 1],
    [v(1, 0, 1, 0, 0), v(0, 0, 0, 1, 0), 3],
    [v(0, 0, 0, 1, 0), v(1, 0, 1, 0, 0), 1],
    [v(0, 0, 0, 1, 0), v(0, 1, 0, 0, 1), 5],
    [v(0, 1, 0, 0, 1), v(0, 0, 0, 1, 0), 4],
  ].map(([reactant, product, rate]) => ({ reactant: reactant as number[], product: product as number[], rate: Q.rational(rate as number) })),
};
const feinbergComplexes = feinberg.reactions.map((r) => r.reactant);
const feinbergProblem = () =>
  realizationProblem({ variables: feinberg.species, rhs: inducedRhs(feinberg) }, feinbergComplexes);

describe("equivalent realizations by MILP", () => {
  it("the dense realization of a deficiency-zero weakly reversible network contains its reactions", async () => {
    const outcome = await searchRealization(feinbergProblem(), "dense", { deadline: deadline() });
    expect(outcome.status).toBe("found");
    if (outcome.status !== "found") return;
    expect(steps(outcome.mechanism)).toEqual(expect.arrayContaining(steps(feinberg)));
  });

  it("Feinberg's network on its own complexes needs all six reactions (no sparser realization)", async () => {
    // By hand: from D the net vector (1, 5, 1, -6, 5) is not parallel to y - D for any candidate y,
    // so D needs two reactions, and A, 2B, A + C, B + E one each.
    const problem = problemOnComplexes({ variables: feinberg.species, rhs: inducedRhs(feinberg) }, feinbergComplexes);
    const outcome = await searchRealization(problem, "sparse", { deadline: deadline() });
    expect(outcome.status === "found" && outcome.mechanism.reactions.length).toBe(6);
  });

  it("Lotka–Volterra: the sparse realization with 2Y available is the textbook three-step scheme", async () => {
    // Minimum three, proved by hand: the ODE has three distinct monomials x, x*y, y and each needs
    // a reaction out of its own complex. Which textbook example and figure Szederkényi (2010) uses
    // could not be checked here (from memory only, so no figure from the paper is asserted); this
    // test asserts the hand-proved minimum instead.
    const { exact } = parseOde("x' = 2*x - 0.5*x*y\ny' = 0.5*x*y - 3*y\n");
    const outcome = await searchRealization(realizationProblem(exact!, [[0, 2]]), "sparse", { deadline: deadline() });
    expect(outcome.status === "found" && steps(outcome.mechanism)).toEqual(["x + y -> 2y", "x -> 2x", "y -> 0"]);
  });

  it("finds a weakly reversible realization of Feinberg's ODE and none for Lotka–Volterra", async () => {
    const found = await searchWeaklyReversible(feinbergProblem(), { deadline: deadline() });
    expect(found.status).toBe("found");
    if (found.status === "found") {
      // Weakly reversible: every reaction joins two complexes of the same strong linkage class.
      const component = strongComponentOf(feinbergProblem().complexes.length, found.edges);
      expect(found.edges.every(({ from, to }) => component[from] === component[to])).toBe(true);
    }
    const { exact } = parseOde("x' = 2*x - 0.5*x*y\ny' = 0.5*x*y - 3*y\n");
    const none = await searchWeaklyReversible(realizationProblem(exact!, [[0, 2]]), { deadline: deadline() });
    expect(none.status).toBe("infeasible");
  });

  it("finds a dense realization where the solver's presolve alone calls a column infeasible", async () => {
    // Found by the property below (fast-check seed 419219792): out of one complex the target is
    // zero, and HiGHS's MIP presolve reported that column infeasible.
    const { exact } = parseOde("a' = 1 - a^3\nb' = b^3\nc' = -a*b^3*c\n");
    const dense = await searchRealization(realizationProblem(exact!), "dense", { deadline: deadline() });
    expect(dense.status).toBe("found");
  });

  it("for random kinetic ODEs: sparse ≤ canonical ≤ dense, and dense contains the sparse and canonical graphs (fast-check)", async () => {
    // Each search already checks Y·A_k = M exactly and throws otherwise.
    await fc.assert(
      fc.asyncProperty(odeArbitrary({ kinetic: true, maxTerms: 6 }), async (ode) => {
        const problem = realizationProblem(ode);
        const sparse = await searchRealization(problem, "sparse", { deadline: deadline() });
        const dense = await searchRealization(problem, "dense", { deadline: deadline() });
        if (sparse.status !== "found" || dense.status !== "found") throw new Error("a kinetic ODE always has a realization");
        const canonical = canonicalRealization(ode).reactions.length;
        expect(sparse.mechanism.reactions.length).toBeLessThanOrEqual(canonical);
        expect(dense.mechanism.reactions.length).toBeGreaterThanOrEqual(canonical);
        const denseEdges = new Set(dense.edges.map(({ from, to }) => `${from}>${to}`));
        expect(sparse.edges.every(({ from, to }) => denseEdges.has(`${from}>${to}`))).toBe(true);
        const index = (c: number[]) => problem.complexes.findIndex((d) => d.join() === c.join());
        expect(canonicalRealization(ode).reactions.every((r) => denseEdges.has(`${index(r.reactant)}>${index(r.product)}`))).toBe(true);
      }),
      { numRuns: 20 },
    );
    // Twenty pairs of MILP searches: seconds on a quiet machine, far more on a loaded CI runner.
  }, 120_000);

  it("gives up at the time limit", async () => {
    expect(await searchRealization(feinbergProblem(), "dense", { deadline: Date.now() - 1 })).toEqual({ status: "time-limit" });
  });

  it("reports progress per source complex", async () => {
    const seen: number[] = [];
    await searchRealization(feinbergProblem(), "sparse", { deadline: deadline(), onProgress: (p) => seen.push(p.done) });
    expect(seen).toEqual(feinbergProblem().complexes.map((_, k) => k + 1));
  });
});
