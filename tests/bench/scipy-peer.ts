// scipy as the peer of the dynamics benchmarks, run in a child python3 process on the very same
// systems: LSODA (`scipy.integrate.odeint`, Fortran) for speed and Radau (`solve_ivp`) at a tight
// tolerance for accuracy. Python is only the peer here; the product never needs it.
import { spawnSync } from "node:child_process";
import type { KineticSpec } from "~/chem/kinetics/kinetic-system";

export interface PeerProblem {
  spec: KineticSpec;
  until: number;
  rtol: number;
  atol: number;
}

export interface PeerFigures {
  /** Best of the timed runs. */
  ms: number;
  steps: number;
  jacobians: number;
  final: number[];
}

// The right-hand side and Jacobian are vectorised numpy over the same rate and change tables our
// kernels use: products over padded factor slots, sums by np.bincount. Shared with the fit bench.
export const PYTHON_MASS_ACTION = String.raw`
def mass_action(p, k):
    """rhs(y, t) and jac(y, t) of the tables in p (massActionTables) with coefficients k."""
    n = len(p["names"]); R = len(p["rates"])
    F = max([1] + [len(r) for r in p["rates"]])
    I = np.zeros((R, F), dtype=np.int64); P = np.zeros((R, F))
    for j, factors in enumerate(p["rates"]):
        for f, (v, power) in enumerate(factors):
            I[j, f] = v; P[j, f] = power
    changes = np.array(p["changes"], dtype=float).reshape(-1, 3)
    cv = changes[:, 0].astype(np.int64); cr = changes[:, 1].astype(np.int64); cc = changes[:, 2]
    # Jacobian entries: one per (change, factor slot that is used), J[cv, I[cr, f]] += cc * dr/dy.
    pairs = [(e, f) for e in range(len(cv)) for f in range(F) if P[cr[e], f] > 0]
    pe = np.array([e for e, _ in pairs], dtype=np.int64); pf = np.array([f for _, f in pairs], dtype=np.int64)
    targets = cv[pe] * n + I[cr[pe], pf]

    def powers(y):
        return np.where(P == 0, 1.0, y[I] ** P)

    def rhs(y, t):
        r = k * np.prod(powers(y), axis=1)
        return np.bincount(cv, weights=cc * r[cr], minlength=n)

    def jac(y, t):
        base = powers(y)
        partial = np.empty((R, F))
        for f in range(F):
            others = np.prod(np.delete(base, f, axis=1), axis=1) if F > 1 else 1.0
            own = np.where(P[:, f] == 0, 0.0, P[:, f] * np.where(P[:, f] == 1, 1.0, y[I[:, f]] ** (P[:, f] - 1)))
            partial[:, f] = k * own * others
        return np.bincount(targets, weights=cc[pe] * partial[cr[pe], pf], minlength=n * n).reshape(n, n)

    return rhs, jac
`;

/** A kinetic spec as the tables PYTHON_MASS_ACTION reads. */
export function massActionTables(spec: KineticSpec) {
  return {
    names: spec.names,
    initial: spec.initial,
    rates: spec.monomials.map((m) => m.factors.map((f) => [f.variable, f.power])),
    coefficients: spec.monomials.map((m) => m.coefficient),
    changes: spec.changes.map((c) => [c.variable, c.rate, c.change]),
  };
}

const SCRIPT = String.raw`
import json, sys, time
import numpy as np
from scipy.integrate import odeint, solve_ivp
${PYTHON_MASS_ACTION}
request = json.load(sys.stdin)
out = []
for p in request["problems"]:
    rhs, jac = mass_action(p, np.array(p["coefficients"], dtype=float))
    y0 = np.array(p["initial"], dtype=float)
    times = []
    for _ in range(p["runs"]):
        start = time.perf_counter()
        if request["method"] == "lsoda":
            y, info = odeint(rhs, y0, [0.0, p["until"]], Dfun=jac, rtol=p["rtol"], atol=p["atol"], full_output=True, mxstep=1000000)
            final, steps, jacobians = y[-1], int(info["nst"][-1]), int(info["nje"][-1])
        else:
            s = solve_ivp(lambda t, y: rhs(y, t), [0.0, p["until"]], y0, method="Radau", jac=lambda t, y: jac(y, t), rtol=p["rtol"], atol=p["atol"])
            final, steps, jacobians = s.y[:, -1], int(s.t.size - 1), int(s.njev)
        times.append((time.perf_counter() - start) * 1000)
    out.append({"ms": min(times), "steps": steps, "jacobians": jacobians, "final": final.tolist()})
print(json.dumps(out))
`;

/** Runs each problem `runs(problem)` times with scipy's LSODA or Radau; null (and a note) when python3 or scipy is missing. */
export function scipyPeer(problems: PeerProblem[], method: "lsoda" | "radau", runs: (problem: PeerProblem) => number): PeerFigures[] | null {
  const input = problems.map((p) => ({
    ...massActionTables(p.spec),
    until: p.until,
    rtol: p.rtol,
    atol: p.atol,
    runs: runs(p),
  }));
  const run = spawnSync("python3", ["-c", SCRIPT], { input: JSON.stringify({ method, problems: input }), encoding: "utf8", maxBuffer: 64 << 20 });
  if (run.status !== 0) {
    console.log(`(scipy's ${method} could not run: ${run.stderr?.trim().split("\n").pop() ?? run.error?.message})`);
    return null;
  }
  return JSON.parse(run.stdout) as PeerFigures[];
}
