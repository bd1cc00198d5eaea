// The part of odex's API our reference checks use. odex ships its TypeScript sources, which do not
// compile under our strict settings; this declaration stands in for them (see tsconfig "paths").
declare module "odex" {
  export type Derivative = (x: number, y: number[]) => number[];
  /** nr is the step number; on the first call (nr = 1) xOld = x and there is no interpolant yet. */
  export type OutputFunction = (nr: number, xOld: number, x: number, y: number[], dense: (c: number, x: number) => number) => boolean | void;

  export class Solver {
    constructor(n: number);
    absoluteTolerance: number;
    relativeTolerance: number;
    denseOutput: boolean;
    maxSteps: number;
    solve(f: Derivative, x: number, y0: number[], xEnd: number, output?: OutputFunction): { y: number[]; outcome: number; nStep: number; nAccept: number; nReject: number; nEval: number };
    grid(dt: number, out: (x: number, y: number[]) => void): OutputFunction;
  }
}
