// The canonical realization of a kinetic polynomial ODE (Hárs and Tóth 1979): one reaction per term.
// For the coefficient c of x^a in x_i', the step a·X → a·X + sign(c)·e_i with rate |c|. A negative
// c needs a_i ≥ 1 so that the product has no negative coefficient — which is exactly the absence of
// negative cross effects.
import type { ExactOde } from "../ode/exact";
import { sortedTerms } from "../ode/polynomial";
import * as Q from "../linalg/rational";
import type { MassActionMechanism } from "./mass-action";

export function canonicalRealization(ode: ExactOde): MassActionMechanism {
  const reactions = ode.rhs.flatMap((rhs, i) =>
    sortedTerms(rhs).map((term) => {
      const product = [...term.exponents];
      product[i] += Q.sign(term.coefficient);
      if (product[i] < 0) throw new RangeError(`${ode.variables[i]}' has a negative cross effect; the ODE is not kinetic`);
      return { reactant: [...term.exponents], product, rate: Q.abs(term.coefficient) };
    }),
  );
  return { species: [...ode.variables], reactions };
}
