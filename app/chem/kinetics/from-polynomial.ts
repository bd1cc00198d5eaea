// A polynomial ODE x' = P(x) as a kinetic system: each distinct monomial is one "rate" with
// coefficient 1, scattered into the equations with its coefficients. Variables may be negative
// (Lorenz, say), so no clipping.

import type { PolynomialOde } from "~/chem/model";
import { compileKineticSystem, type KineticSpec, type KineticSystem, type MonomialRate } from "./kinetic-system";

export function polynomialSpec(ode: PolynomialOde): KineticSpec {
  const monomials: MonomialRate[] = [];
  const rateOf = new Map<string, number>();
  const changes: KineticSpec["changes"] = [];
  ode.rhs.forEach((terms, variable) => {
    for (const term of terms) {
      if (term.coefficient === 0) continue;
      const key = term.exponents.join(",");
      let rate = rateOf.get(key);
      if (rate === undefined) {
        rate = monomials.length;
        rateOf.set(key, rate);
        monomials.push({
          coefficient: 1,
          factors: term.exponents.flatMap((power, v) => (power === 0 ? [] : [{ variable: v, power }])),
        });
      }
      changes.push({ variable, rate, change: term.coefficient });
    }
  });
  return { names: ode.variables, initial: ode.initial, nonNegative: false, monomials, custom: [], changes };
}

export function polynomialSystem(ode: PolynomialOde): KineticSystem {
  return compileKineticSystem(polynomialSpec(ode));
}
