/**
 * ODE integration for the transient models, through odex 2.0.x (Hairer's
 * ODEX extrapolation method). This module and ./odex-solver.js are the only
 * ones that touch odex, so a build that needs it routed elsewhere changes
 * one line here.
 */
import { SolveError } from '../errors.js';
import { Solver } from './odex-solver.js';

export interface GridSolution {
  /** Sample times, s (0, dt, 2·dt, … up to t1). */
  t: number[];
  /** State at each sample time. */
  y: number[][];
  steps: number;
}

export interface IntegrateOptions {
  relativeTolerance?: number;
  absoluteTolerance?: number;
  maxSteps?: number;
}

/** Integrates y' = f(t, y) from 0 to t1 and samples the dense output every dt. */
export function integrateOnGrid(f: (t: number, y: number[]) => number[], y0: number[], t1: number, dt: number, opts: IntegrateOptions = {}): GridSolution {
  const solver = new Solver(y0.length);
  solver.denseOutput = true;
  solver.relativeTolerance = opts.relativeTolerance ?? 1e-10;
  solver.absoluteTolerance = opts.absoluteTolerance ?? 1e-12;
  solver.maxSteps = opts.maxSteps ?? 100_000;
  const t: number[] = [];
  const y: number[][] = [];
  const result = solver.solve(
    f,
    0,
    y0,
    t1,
    solver.grid(dt, (tOut, yOut) => {
      if (tOut <= t1 + dt * 1e-9) {
        t.push(tOut);
        y.push(yOut.slice());
      }
    }),
  );
  if (result.outcome !== 0) {
    throw new SolveError('no_convergence', `ODE integration stopped before ${t1} s (outcome ${result.outcome})`, { reachedS: t[t.length - 1] ?? 0 });
  }
  return { t, y, steps: result.nStep };
}
