/** Declarations for the part of odex 2.0.x that shared/balance/ode.ts uses. */
export type Derivative = (x: number, y: number[]) => number[];
export type OutputFunction = (nr: number, xOld: number, x: number, y: number[], dense?: (c: number, x: number) => number) => boolean | void;

export declare class Solver {
  constructor(n: number);
  n: number;
  maxSteps: number;
  initialStepSize: number;
  maxStepSize: number;
  denseOutput: boolean;
  relativeTolerance: number | number[];
  absoluteTolerance: number | number[];
  grid(dt: number, out: (xOut: number, yOut: number[]) => unknown): OutputFunction;
  solve(f: Derivative, x: number, y0: number[], xEnd: number, solOut?: OutputFunction): { y: number[]; outcome: number; nStep: number; xEnd: number; nEval: number; nAccept: number; nReject: number };
}
