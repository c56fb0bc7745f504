/**
 * A dense convex quadratic programme and what solving it returns:
 *
 *   minimise 1/2 x'Px + q'x  subject to  A x = b,  G x <= h,  lb <= x <= ub.
 *
 * P is symmetric positive semidefinite (dense, row-major). Constraint rows are sparse (most
 * mandate rows touch a few variables: a cap ties one weight to the scale, a group band its
 * members). Bounds may be infinite. The solver never sees names: the mandate layer keeps a label
 * per row and turns the indices of a result into words.
 */
import type { Matrix } from '../../linalg/matrix.js';

export interface SparseRow {
  idx: readonly number[];
  val: readonly number[];
}

export interface QpProblem {
  P: Matrix;
  q: Float64Array;
  A: readonly SparseRow[];
  b: Float64Array;
  G: readonly SparseRow[];
  h: Float64Array;
  lb: Float64Array;
  ub: Float64Array;
}

/** The active set of an earlier solve: restarting from it costs one linear solve when it still holds. */
export interface QpWarmStart {
  activeRows: readonly number[];
  atLower: readonly number[];
  atUpper: readonly number[];
}

export interface QpSolution {
  x: Float64Array;
  /** Multipliers of A x = b (sign: the Lagrangian adds y'(Ax - b)). */
  y: Float64Array;
  /** Multipliers of G x <= h, >= 0. */
  z: Float64Array;
  /** Multipliers of the lower and upper bounds, >= 0. */
  zl: Float64Array;
  zu: Float64Array;
  objective: number;
}

export interface QpStats {
  /** Interior-point iterations plus polishing solves. */
  iterations: number;
  /** Relative KKT residual of the returned point (see kkt-residual.ts). */
  kktResidual: number;
  ms: number;
  /** How the answer was reached, for diagnostics and the tests. */
  path: 'warm-start' | 'screened' | 'interior-point+polish' | 'interior-point';
}

/** A set of constraints that cannot hold together (a phase-one certificate). */
export interface QpConflict {
  rowsA: number[];
  rowsG: number[];
  lower: number[];
  upper: number[];
  /** Least total violation any point must incur (0 would mean feasible). */
  violation: number;
}

export type QpResult =
  | ({ status: 'optimal'; solution: QpSolution; warmStart: QpWarmStart } & QpStats)
  | ({ status: 'infeasible'; conflict: QpConflict } & QpStats)
  | ({ status: 'iteration-limit'; solution: QpSolution } & QpStats)
  | ({ status: 'error'; reason: string } & QpStats);

/** Named tolerances and limits (each says what it controls). */
export const QP_TOLERANCES = {
  /** Relative KKT residual accepted as optimal: the accuracy target. */
  optimality: 1e-10,
  /** The interior point stops here and hands over to polishing (active set identified). */
  interiorPointHandover: 1e-9,
  /** If polishing fails, the interior point continues to this residual. */
  interiorPointFinal: 1e-11,
  /** Interior-point iteration limit. */
  maxIterations: 200,
  /** Fraction of the distance to the boundary an interior-point step may travel. */
  stepToBoundary: 0.99,
  /** Least total constraint violation (relative) that phase one reads as infeasible. */
  infeasibility: 1e-8,
  /** Primal slack below which polishing treats a constraint as satisfied. */
  polishFeasibility: 1e-9,
  /** Regularisation of the polishing KKT matrix (removed again by iterative refinement). */
  polishRegularisation: 1e-11,
  /** Active-set corrections polishing may make before it gives up. */
  polishRounds: 8,
  /** Iterative-refinement passes of a polishing solve. */
  refinementSteps: 6,
} as const;
