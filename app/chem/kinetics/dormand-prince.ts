// Dormand–Prince 5(4), the explicit pair for non-stiff problems, as data: the tableau,
// DOPRI5's continuous extension and stiffness boundary, and its PI step-size controller.
// Coefficients: J. R. Dormand & P. J. Prince, J. Comput. Appl. Math. 6 (1980) 19–26; dense output,
// controller and stiffness test: E. Hairer, S. P. Nørsett & G. Wanner, Solving Ordinary
// Differential Equations I, 2nd ed., Springer 1993, §II.4–II.6 and §IV.2 of volume II.

import type { ExplicitPair } from "./explicit-runge-kutta";

/** The PI memory's exponent on the previous error (DOPRI5's default). */
const BETA = 0.04;

export const dormandPrince54: ExplicitPair = {
  order: 5,
  embeddedOrder: 4,
  a: [
    [1 / 5],
    [3 / 40, 9 / 40],
    [44 / 45, -56 / 15, 32 / 9],
    [19372 / 6561, -25360 / 2187, 64448 / 6561, -212 / 729],
    [9017 / 3168, -355 / 33, 46732 / 5247, 49 / 176, -5103 / 18656],
  ],
  b: [35 / 384, 0, 500 / 1113, 125 / 192, -2187 / 6784, 11 / 84, 0],
  e: [71 / 57600, 0, -71 / 16695, 71 / 1920, -17253 / 339200, 22 / 525, -1 / 40],
  dense: [
    -12715105075 / 11282082432,
    0,
    87487479700 / 32700410799,
    -10690763975 / 1880347072,
    701980252875 / 199316789632,
    -1453857185 / 822651844,
    69997945 / 29380423,
  ],
  stabilityBoundary: 3.25,
  controller: {
    exponent: 0.2 - BETA * 0.75,
    beta: BETA,
    predictive: false,
    safety: 0.9,
    maxGrowth: 10,
    maxShrink: 5,
    errorFloor: 1e-4,
  },
};
