/**
 * The result of solving one candidate: the shape `holdfast solve --json` prints, the app shows
 * and the memo prints. A status union, never a bare array of weights.
 */
import type { CandidateMetrics } from '../analytics/weights-metrics.js';

export type { CandidateMetrics };

export type SolveStatus = 'optimal' | 'infeasible' | 'iteration-limit' | 'error';

export interface SolverReport {
  iterations: number;
  /** Relative KKT residual of the final iterate. */
  kktResidual: number;
  ms: number;
}

/** Why an asset is held at its weight or left out, in numbers (optimality conditions). */
export interface AssetExplanation {
  asset: string;
  weight: number;
  /** e.g. 'held', 'excluded', 'at-upper-bound', 'at-lower-bound', 'group-limit'. */
  reason: string;
  /** A sentence an advisor can repeat, with the figures in it. */
  text: string;
  correlationWithPortfolio?: number;
  /**
   * The figure the optimality condition compares with `threshold`: the correlation with the
   * portfolio (maximum diversification), the beta to it (minimum variance, maximum
   * decorrelation), the share of risk (equal risk contribution, threshold = its budget), the
   * expected return (maximum Sharpe ratio, threshold = what its beta asks).
   */
  measure?: number;
  threshold?: number;
  /** A binding band or portfolio-wide limit this asset sits in, in words: "the Equity band binds". */
  limitBinding?: string;
}

/** A binding constraint and its shadow price in the objective's own units. */
export interface BindingConstraint {
  constraint: string;
  /** Change of the objective per unit (1.00 = 100 percentage points) relaxation. */
  shadowPrice: number;
  objectiveUnit: string;
  text: string;
}

interface CandidateHead {
  id: string;
  label?: string;
  solver: SolverReport;
}

/** Weights and their figures: the solver reached the optimum. */
export interface OptimalCandidate extends CandidateHead {
  status: 'optimal';
  weights: Record<string, number>;
  metrics: CandidateMetrics;
  /** Absent where only the weights were asked for (the walk-forward's rebalances). */
  explanations?: CandidateExplanations;
}

/** Weights and their figures from the last iterate: usable, with the residual told in `message`. */
export interface IterationLimitCandidate extends Omit<OptimalCandidate, 'status'> {
  status: 'iteration-limit';
  message: string;
}

/** No weights: the limits contradict each other, or the problem cannot be solved as posed. */
export interface FailedCandidate extends CandidateHead {
  status: 'infeasible' | 'error';
  /** What went wrong, in words a person can act on. */
  message: string;
}

export interface CandidateExplanations {
  assets: AssetExplanation[];
  binding: BindingConstraint[];
  flags: string[];
}

/** One candidate's result: its status says which fields it has (OSQP's status table is the model). */
export type CandidateResult = OptimalCandidate | IterationLimitCandidate | FailedCandidate;

/** A candidate with weights and metrics to show. */
export type SolvedCandidate = OptimalCandidate | IterationLimitCandidate;

export function isSolved(c: CandidateResult): c is SolvedCandidate {
  return c.status === 'optimal' || c.status === 'iteration-limit';
}
