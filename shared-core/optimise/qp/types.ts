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
  /**
   * The interior point stops here and hands over to polishing (active set identified). 1e-7
   * since a polishing round that fails costs one solve without refinement (polish.ts): random
   * problems of qp-solver.test.ts (seeds 1-1300, and 61-260 at n 100-399) 13332 -> 12100
   * iterations from 1e-9, every status and objective the same; the bench's N = 1500 binding
   * caps 11 -> 10, turnover 1868 -> 1686 ms in-process.
   */
  interiorPointHandover: 1e-7,
  /** When polishing fails, the interior point resumes to this many times the last residual. */
  interiorPointResume: 1e-2,
  /** The last residual the interior point resumes to. */
  interiorPointFinal: 1e-11,
  /** Interior-point iteration limit. */
  maxIterations: 200,
  /** Fraction of the distance to the boundary an interior-point step may travel, at least. */
  stepToBoundary: 0.99,
  /**
   * At most: the fraction is 1 - residual between the two (interior-point.ts). Measured on the
   * random problems of qp-solver.test.ts (seeds 301-1300, n 4-63) and the bench's N = 500
   * problems: 0.99 fixed 9203 iterations, 1 - residual capped here 8799; a fixed 0.999 took 20-23
   * iterations instead of 10-11 on three of the bench's 21 problems.
   */
  stepToBoundaryMost: 0.9999,
  /** Least total constraint violation (relative) that phase one reads as infeasible. */
  infeasibility: 1e-8,
  /** Primal slack below which polishing treats a constraint as satisfied. */
  polishFeasibility: 1e-9,
  /**
   * Residual of polishing's linear system (relative to 1 + its largest right-hand side) from
   * which it judges a guess of the active set, a thousandth of polishFeasibility: a guess that
   * fails is not refined to the rounding level first (polish.ts).
   */
  polishDecision: 1e-12,
  /**
   * First ridge, relative to the largest diagonal entry, added to a matrix that should be
   * positive definite but does not factor (a direction free of curvature and constraints,
   * dependent equality rows); each further attempt multiplies it by 100. Iterative refinement
   * removes its effect where the system itself is non-singular.
   */
  ridgeStart: 1e-14,
  /** Attempts with a growing ridge before a factorisation is given up. */
  ridgeAttempts: 8,
  /**
   * A row of polishing's Schur complement whose pivot is below this share of its diagonal entry
   * (the squared sine of its angle to the rows before it) counts as dependent where a solve must
   * know (substitute-two-entry-rows.ts). Dependent rows leave pivots at rounding level, about
   * 1e-16 to 1e-13 relative; 1e-10 keeps a thousandfold margin above that.
   */
  independentRows: 1e-10,
  /** Active-set corrections polishing may make before it gives up. */
  polishRounds: 8,
  /** Iterative-refinement passes of a polishing solve. */
  refinementSteps: 6,
  /** Phase one's proximal term eps/2 |x|^2, which keeps its elastic problem strictly convex. */
  phaseOneProximal: 1e-10,
  /** A phase-one multiplier above this names its constraint in the conflict. */
  phaseOneCertificate: 1e-6,

  // Screening (solve-qp.ts): long-only problems solved on a working set of variables first.
  /** Screening applies from this many variables (below it the full problem is cheap). */
  screenFrom: 150,
  /** Least size of the first working set. */
  screenInitial: 60,
  /**
   * The first working set holds this many times 1 / (smallest cap) variables: a capped optimum
   * holds at least 1 / cap assets, so a set of 2 / cap leaves room for the held ones and some
   * left out; a set too small costs a round, never a wrong answer (the dual test adds what it
   * left out).
   */
  screenPerCap: 2,
  /**
   * Screening gives up, for the full problem, once its working set would pass this share of the
   * variables: the interior point's work per iteration grows as the cube of the set, and a set
   * of half the variables already costs an eighth of the full problem's at every iteration.
   */
  screenShare: 0.5,
  /**
   * Where the first working set passes screenShare (caps so tight that the optimum holds most of
   * the universe), screening tries once a tighter set of this many times 1 / (smallest cap): a
   * capped optimum holds at least 1 / cap assets, and a fifth more leaves room for the held ones.
   * A held-out asset that belongs in the optimum shows in the dual test, and polishing adds it
   * (screenPolishRounds); where polishing cannot finish, the full problem is solved.
   */
  screenPerCapTight: 1.2,
  /**
   * The tighter set is tried only up to this share of the variables: its factorisations cost at
   * most 0.85^3 = 0.61 of the full problem's, so one attempt that fails adds at most that to the
   * full solve, and one that succeeds saves at least 39 % of it. Measured on the bench's
   * most-held universes (N = 1500, 2000 and 3000, seeds 1 and 2, caps 1.2/N to 2/N; issue 20 in
   * optimise/README.md): solver 997-2435 -> 716-1542 ms at caps 1.5/N, 1004-6534 -> 512-2934 ms at
   * 2/N, and at 1.2/N, where 1.2/cap is the whole universe, the full solve as before.
   */
  screenShareTight: 0.85,
  /**
   * The tighter set applies from this many variables: below it the factorisations it saves are a
   * small part of a solve (at N = 500 a factorisation takes about 3 ms of the solver's 100-150),
   * and at N = 500 (seeds 1 and 2, caps 1.5/N, 6 alternating runs each) it gained on one seed and
   * lost on the other; at N = 1000 it gained on 5 of the 6 universes with the caps at 1.5/N to 3/N.
   */
  screenTightFrom: 1000,
  /** Rounds (working sets) screening tries before it gives up. */
  screenRounds: 4,
  /** Variables added when a working set is too small to meet the limits, at least. */
  screenBatchMin: 20,
  /** Relative dual tolerance of the test that a held-out variable belongs at its bound. */
  screenDual: 1e-10,
  /**
   * Active-set corrections screening's polishing may make from the first working set's answer
   * with the violators freed, each one linear solve on the free variables.
   */
  screenPolishRounds: 12,
  /**
   * Rounds in a row that do not halve the fewest constraints changed by a round before, after
   * which screening's polishing gives up for the full solve. Measured on the live-recompute
   * universes (N = 150-300, seeds 1-3, six estimator-objective pairs): where polishing converged
   * the count fell 3- to 30-fold per round (42, 6, done; 31, 5, 1, done); on the EWMA estimates
   * (condition numbers near 1e9) it fell by a quarter or less (225, 170, 172, 161, ...) and had
   * not converged after 12 rounds.
   */
  screenPolishStall: 2,
} as const;
