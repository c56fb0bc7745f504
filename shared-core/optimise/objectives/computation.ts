import type { Matrix } from '../../linalg/matrix.js';
import type { ObjectiveSpec } from '../../scenario/objective-spec.js';
import type { AssetFigures, ObjectiveScale } from '../explain.js';
import type { Formulation } from '../formulate.js';
import type { LinearMandate } from '../mandate.js';
import type { QpResult, QpSolution, QpWarmStart } from '../qp/index.js';
import type { CandidateProblem } from '../solve-candidate.js';

/**
 * How one objective computes: its weights, the quantity its shadow prices are told in, and each
 * asset's explanation from its optimality conditions. One file per objective in this folder,
 * beside its definition's words in shared-core/methods/objectives/; index.ts lists them by
 * method, and a method defined there without its computation here fails the typecheck.
 */
export interface ObjectiveComputation<S extends ObjectiveSpec = ObjectiveSpec> {
  /**
   * Weights from a rule on the volatilities alone (equal weight, inverse volatility): the
   * covariance's conditioning does not matter, and a binding turnover limit is not flagged.
   */
  ruleBased: boolean;
  /**
   * Refuses a scenario this objective cannot run on before anything is estimated (an InputError
   * at the JSON path of what is missing or unknown).
   */
  checkInputs?: (spec: S, at: InputsAt) => void;
  /** The weights: a QP for solve-candidate.ts to run, weights found here, or why there are none. */
  solve: (spec: S, at: SolveAt) => ObjectiveStep;
  /** Why the homogenised form has no solution when the mandate itself is feasible. */
  noPositiveRatio?: (spec: S) => string;
  /** Each asset's threshold with the binding limits counted (formulate.ts), where the objective has one. */
  thresholds?: (form: Formulation, solution: QpSolution, n: number) => Float64Array | undefined;
  /** How the solver's multipliers reach the quantity of the definition's `shadowPrice` words. */
  scale: (phi: number, at: ScaleAt) => Omit<ObjectiveScale, 'name' | 'unit'>;
  /** Portfolio-wide figures once, then each asset's sentence and the figures it compares. */
  explainer: (spec: S, fig: AssetFigures, portfolio: PortfolioFigures) => (i: number, at: AssetAt) => AssetWords;
}

/** What an objective's input check reads: the scenario's assets and its candidate's place. */
export interface InputsAt {
  assets: readonly string[];
  expectedReturns?: Readonly<Record<string, number>>;
  /** The JSON path of the candidate's objective: `candidates[2].objective`. */
  path: string;
}

/** What an objective's solve reads. */
export interface SolveAt {
  problem: CandidateProblem;
  mandate: LinearMandate;
  /** Annualised covariance. */
  covariance: Matrix;
  vols: Float64Array;
}

/** What the objective's solve hands back, with the figures its explanations need. */
export type ObjectiveStep = (
  | {
      kind: 'qp';
      form: Formulation;
      /** Scores that order the assets for screening (solve-candidate.ts screeningScore). */
      screen?: Float64Array;
    }
  | {
      kind: 'weights';
      weights: Float64Array;
      iterations: number;
      residual: number;
      form?: Formulation;
      qp?: QpResult;
      warmStart?: QpWarmStart;
    }
  | { kind: 'failed'; status: 'error' | 'infeasible'; message: string; iterations: number }
) & {
  /** Said beside the weights, after the solve. */
  flags?: string[];
  figures?: StepFigures;
};

export interface StepFigures {
  budgets?: Float64Array;
  expected?: Float64Array;
  /** The correlation matrix the objective solved on (maximum decorrelation). */
  correlation?: Matrix;
  ruleWeights?: Float64Array;
}

export interface ScaleAt {
  S: Matrix;
  m: LinearMandate;
  w: Float64Array;
  form: Formulation | null;
  q: QpResult | null;
  budgets?: Float64Array;
  ruleWeights?: Float64Array;
}

/** The same for every asset: the diversification ratio, the portfolio's variance. */
export interface PortfolioFigures {
  n: number;
  dr: number;
  variance: number;
  /** "1/DR = 0.62 without them". */
  withoutDr: string;
}

/** One asset's position against its limits, in words the sentences share. */
export interface AssetAt {
  reason: 'at-upper-bound' | 'excluded' | 'at-lower-bound' | 'group-limit' | 'held';
  /** Correlation with the portfolio. */
  rho: number;
  /** 'cap' or 'liquidity cap'. */
  capWord: string;
  /** The binding band or limit the asset sits in, if any. */
  band?: string;
  /** ", away from it because ..." for an asset held away from its condition by a band. */
  tail: string;
  /** ", but ... keeps it out" for an asset its own figure would have held. */
  keptOut: string;
}

export interface AssetWords {
  text: string;
  /** The figure the optimality condition compares with `threshold`; absent for rule-based weights. */
  measure?: number;
  threshold?: number;
}
