/**
 * Types for the `odex` 2.0.4 reference solver (Hairer & Wanner's ODEX, used by tests only). The
 * package ships its TypeScript source beside the JavaScript, and that source does not compile
 * under our strict settings; this declaration (mapped in tsconfig.json "paths") describes the part
 * of its API the tests use (README of odex 2.0.4).
 */
declare module 'odex' {
  export type Derivative = (x: number, y: number[]) => number[];
  export type OutputFunction = (
    nr: number,
    xold: number,
    x: number,
    y: number[],
    dense?: (c: number, x: number) => number,
  ) => boolean | void;
  export interface SolverResult {
    y: number[];
    outcome: number;
    nStep: number;
    xEnd: number;
    nAccept: number;
    nReject: number;
    nEval: number;
  }
  export class Solver {
    constructor(n: number);
    n: number;
    absoluteTolerance: number | number[];
    relativeTolerance: number | number[];
    maxSteps: number;
    initialStepSize: number;
    maxStepSize: number | number[];
    denseOutput: boolean;
    [option: string]: unknown;
    solve(f: Derivative, x: number, y0: number[], xEnd: number, solOut?: OutputFunction): SolverResult;
    grid(dt: number, out: (x: number, y: number[]) => boolean | void): OutputFunction;
  }
  export const Outcome: { Converged: number; MaxStepsExceeded: number; EarlyReturn: number };
}
