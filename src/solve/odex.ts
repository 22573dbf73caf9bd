/**
 * Typed access to odex 2.0.4 (Hairer–Wanner ODEX, Gragg–Bulirsch–Stoer extrapolation with dense output).
 * The package ships TypeScript sources next to its JavaScript and no declarations, so strict tsc would
 * type-check its own source; loading it through createRequire keeps our build strict and its code untouched.
 */
import { createRequire } from 'node:module';

export type Derivative = (x: number, y: number[]) => number[];
export type Dense = (component: number, x: number) => number;
export type StepObserver = (step: number, xOld: number, x: number, y: number[], dense?: Dense) => boolean | void;

export interface OdexSolver {
  n: number;
  absoluteTolerance: number | number[];
  relativeTolerance: number | number[];
  maxSteps: number;
  maxStepSize: number;
  initialStepSize: number;
  denseOutput: boolean;
  denseComponents?: number[];
  solve(f: Derivative, x0: number, y0: number[], xEnd: number, observer?: StepObserver): OdexResult;
}

export interface OdexResult {
  y: number[];
  /** 0 converged, 1 max steps exceeded, 2 early return */
  outcome: number;
  nStep: number;
  nAccept: number;
  nReject: number;
  nEval: number;
}

export const OUTCOME_CONVERGED = 0;
export const OUTCOME_MAX_STEPS = 1;
export const OUTCOME_EARLY_RETURN = 2;

const require = createRequire(import.meta.url);
const odex = require('odex') as { Solver: new (n: number) => OdexSolver };

export function createSolver(size: number): OdexSolver {
  return new odex.Solver(size);
}
