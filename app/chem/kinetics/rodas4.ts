// RODAS4 as data: a 6-stage, L-stable, stiffly accurate Rosenbrock method of order 4 with an
// embedded order-3 solution, a 3rd-order continuous extension, and Gustafsson's predictive
// step-size controller. Coefficients in the transformed form (W = I/(hγ) − J): E. Hairer &
// G. Wanner, Solving Ordinary Differential Equations II, 2nd ed., Springer 1996, §IV.7, and the
// RODAS code that accompanies the book.

import type { RosenbrockMethod } from "./rosenbrock";

/**
 * Stiffly accurate: stage 5's input is the embedded solution, stage 5's input plus u_5 the
 * propagated one, so the error estimate is u_5 alone. Stage 4's row repeats inside both.
 */
const stage4 = [1.221224509226641, 6.019134481288629, 12.53708332932087, -0.687886036105895];

export const rodas4: RosenbrockMethod = {
  order: 4,
  embeddedOrder: 3,
  gamma: 0.25,
  a: [
    [1.544],
    [0.9466785280815826, 0.2557011698983284],
    [3.314825187068521, 2.896124015972201, 0.9986419139977817],
    stage4,
    [...stage4, 1],
  ],
  c: [
    [-5.6688],
    [-2.430093356833875, -0.2063599157091915],
    [-0.1073529058151375, -9.594562251023355, -20.47028614809616],
    [7.496443313967647, -10.24680431464352, -33.99990352819905, 11.7089089320616],
    [8.083246795921522, -7.981132988064893, -31.52159432874371, 16.31930543123136, -6.058818238834054],
  ],
  m: [...stage4, 1, 1],
  e: [0, 0, 0, 0, 0, 1],
  dense: [
    [10.12623508344586, -7.487995877610167, -34.80091861555747, -7.992771707568823, 1.025137723295662],
    [-0.6762803392801253, 6.087714651680015, 16.43084320892478, 24.76722511418386, -6.594389125716872],
  ],
  controller: {
    exponent: 0.25,
    beta: 0,
    predictive: true,
    safety: 0.9,
    maxGrowth: 6,
    maxShrink: 5,
    errorFloor: 1e-2,
  },
};
