/**
 * One candidate: an objective on an annualised covariance under a mandate, solved exactly, with
 * metrics and explanations. The one function the command line, the app's worker, the memo and
 * walk-forward call, so the figures they show cannot disagree.
 */
import { assetVolatilities, effectiveBets } from '../analytics/risk.js';
import { metricsOfWeights } from '../analytics/weights-metrics.js';
import { conditionNumber } from '../linalg/condition.js';
import type { TridiagonalForm } from '../linalg/tridiagonal-form.js';
import { allFinite, identity, multiplyVector, type Matrix } from '../linalg/matrix.js';
import { objectiveDefinition } from '../methods/objective-registry.js';
import type { ObjectiveSpec } from '../scenario/objective-spec.js';
import type { AssetInfo, Constraints } from '../scenario/schema.js';
import { nowMs } from './clock.js';
import { solveWithMinimumPosition } from './minimum-position.js';
import { explainAssets, explainBinding, pctText, type AssetFigures } from './explain.js';
import { directForm, sensitivities, weightsOf, type Formulation, type Sensitivity } from './formulate.js';
import { arithmeticConflicts, describeConflict } from './infeasibility.js';
import { buildMandate, type LinearMandate } from './mandate.js';
import { objectiveComputation } from './objectives/index.js';
import { phaseOne, solveQp, type QpResult, type QpWarmStart } from './qp/index.js';
import type { CandidateExplanations, CandidateMetrics, CandidateResult, SolvedCandidate } from './result.js';
import { screenPlan } from './screening.js';

/** Above this condition number the covariance is treated as singular (common practice for double precision). */
export const CONDITION_LIMIT = 1e12;

export interface CandidateProblem {
  id: string;
  label?: string;
  /** Asset ids in the covariance's order. */
  assets: readonly string[];
  /** Annualised covariance. */
  covariance: Matrix;
  objective: ObjectiveSpec;
  constraints: Constraints;
  current?: Record<string, number>;
  expectedReturns?: Record<string, number>;
  assetInfo?: Record<string, AssetInfo>;
  /** From the estimate's diagnostics when known (saves recomputing it). */
  conditionNumber?: number;
  /**
   * The tridiagonal form (linalg/tridiagonal-form.ts) of the covariance or of a positive multiple
   * of it (the per-period estimate), shared by the candidates of one estimate.
   */
  spectrum?: () => TridiagonalForm;
  observations?: number;
  estimator?: string;
  warmStart?: QpWarmStart;
  /** Polled while solving; a true answer throws CancelledError (stability/cancel.ts), nothing partial. */
  shouldCancel?: () => boolean;
  /**
   * `weights`: the walk-forward's many solves need only the weights; the effective number of
   * bets (an eigen-decomposition) is NaN and there are no explanations. `full` by default.
   */
  detail?: 'full' | 'weights';
}

export interface CandidateSolve {
  result: CandidateResult;
  /** Pass back as `warmStart` on the next, similar solve (walk-forward, live recompute). */
  warmStart?: QpWarmStart;
}

/** Every metric but the effective bets (NaN here), which wait for the spectrum: see solveOnce. */
function metricsOf(w: Float64Array, p: CandidateProblem, m: LinearMandate): CandidateMetrics {
  let turnover = 0;
  const inside = new Set(p.assets);
  for (let i = 0; i < w.length; i++) turnover += Math.abs(w[i] - m.current[i]);
  for (const [a, v] of Object.entries(p.current ?? {})) if (!inside.has(a)) turnover += Math.abs(v);
  return metricsOfWeights(w, p.assets, p.covariance, { turnover: p.current ? turnover : 0, effectiveBets: NaN });
}

function covarianceProblem(p: CandidateProblem): string | null {
  const S = p.covariance;
  const n = p.assets.length;
  if (S.rows !== n || S.cols !== n) return `the covariance is ${S.rows} x ${S.cols} for ${n} assets`;
  if (!allFinite(S.data)) return 'the covariance has missing or infinite entries';
  for (let i = 0; i < n; i++)
    if (!(S.data[i * n + i] > 0))
      return `${p.assets[i]} has zero variance over the window, so its risk cannot be estimated`;
  return null;
}

function conditioningProblem(p: CandidateProblem): string | null {
  const n = p.assets.length;
  const cond = p.conditionNumber ?? conditionNumber(p.covariance).value;
  if (!(cond <= CONDITION_LIMIT)) {
    const tail =
      p.observations !== undefined && p.observations <= n
        ? ` ${n} assets with only ${p.observations} observations make the ${p.estimator ?? 'sample'} covariance singular.`
        : ' Two assets may move identically (a duplicated asset), or the window may be too short.';
    return `the covariance is singular or badly conditioned (condition number ${Number.isFinite(cond) ? cond.toExponential(1) : 'infinite'}), so the optimum would be arbitrary.${tail} Choose a shrinkage estimator such as ledoit-wolf or oas.`;
  }
  return null;
}

export function solveCandidateDetailed(p: CandidateProblem): CandidateSolve {
  const size = p.constraints.minPosition;
  return size !== undefined ? solveWithMinimumPosition(p, size, solveOnce) : solveOnce(p);
}

function solveOnce(p: CandidateProblem): CandidateSolve {
  const t0 = nowMs();
  const n = p.assets.length;
  const head = { id: p.id, ...(p.label !== undefined ? { label: p.label } : {}) };
  const fail = (status: 'error' | 'infeasible', message: string, iterations = 0): CandidateSolve => ({
    result: {
      ...head,
      status,
      message,
      solver: { iterations, kktResidual: NaN, ms: nowMs() - t0 },
    },
  });
  const computation = objectiveComputation(p.objective);
  const covIssue = covarianceProblem(p) ?? (computation.ruleBased ? null : conditioningProblem(p));
  if (covIssue) return fail('error', covIssue);
  const m = buildMandate(p.assets, p.constraints, p.current, p.assetInfo);
  const conflicts = arithmeticConflicts(m);
  if (conflicts.length > 0) return fail('infeasible', conflicts.join('; '));

  const S = p.covariance;
  const vols = assetVolatilities(S);
  let f: Formulation | null = null;
  let qp: QpResult | null = null;
  let weights: Float64Array | null = null;
  let iterations = 0;
  let residual = 0;
  let warmStart: QpWarmStart | undefined;
  const flags: string[] = [];

  const runQp = (form: Formulation, score?: Float64Array) => {
    f = form;
    qp = solveQp(form.qp, {
      warmStart: p.warmStart,
      shouldCancel: p.shouldCancel,
      screen: score ? (screenPlan(m, score) ?? undefined) : undefined,
    });
    iterations += qp.iterations;
    residual = qp.kktResidual;
    if (qp.status === 'optimal') {
      weights = weightsOf(form, qp.solution.x, n);
      warmStart = qp.warmStart;
    } else if (qp.status === 'iteration-limit') weights = weightsOf(form, qp.solution.x, n);
  };

  // The objective's own computation (objectives/): a QP to run here, or weights it found itself.
  const step = computation.solve(p.objective, { problem: p, mandate: m, covariance: S, vols });
  if (step.kind === 'failed') return fail(step.status, step.message, step.iterations);
  if (step.kind === 'qp') runQp(step.form, step.screen);
  else {
    weights = step.weights;
    iterations += step.iterations;
    residual = step.residual;
    f = step.form ?? null;
    qp = step.qp ?? null;
    warmStart = step.warmStart;
  }
  flags.push(...(step.flags ?? []));
  const { budgets, expected, correlation: C, ruleWeights } = step.figures ?? {};

  const q = qp as QpResult | null;
  const form = f as Formulation | null;
  if (q && q.status === 'infeasible' && form) {
    if (form.form === 'direct') return fail('infeasible', describeConflict(m, form, q.conflict), iterations);
    // The homogenised form always lists its normalising row; name the mandate's own conflict
    // from the weights' form, or say that the ratio's numerator cannot be positive.
    const plain = directForm(m, identity(n));
    const one = phaseOne(plain.qp, p.shouldCancel);
    iterations += one.iterations;
    if (!one.feasible) return fail('infeasible', describeConflict(m, plain, one.conflict), iterations);
    return fail(
      'infeasible',
      computation.noPositiveRatio?.(p.objective) ??
        'no portfolio within the limits has a positive diversification ratio',
      iterations,
    );
  }
  if (q && q.status === 'error') return fail('error', `the solver failed: ${q.reason}`, iterations);
  if (!weights) return fail('error', 'no weights were produced', iterations);
  const w = weights as Float64Array;
  if (m.longOnly) for (let i = 0; i < n; i++) if (w[i] < 0 && w[i] > -1e-12) w[i] = 0;

  const metrics = metricsOf(w, p, m);
  const solved = (): SolvedCandidate => {
    const figures = {
      weights: Object.fromEntries(p.assets.map((a, i) => [a, w[i]])),
      metrics,
      solver: { iterations, kktResidual: residual, ms: nowMs() - t0 },
    };
    return q && q.status === 'iteration-limit'
      ? {
          ...head,
          status: 'iteration-limit',
          message: `stopped at the iteration limit with KKT residual ${residual.toExponential(1)}`,
          ...figures,
        }
      : { ...head, status: 'optimal', ...figures };
  };
  if (p.detail === 'weights') return { result: solved(), warmStart };
  const explanations = explain();
  metrics.effectiveBets = effectiveBets(w, S, p.spectrum?.());
  const result: CandidateResult = { ...solved(), explanations };
  return { result, warmStart };

  function explain(): CandidateExplanations {
    const sens: Sensitivity[] = form && q && q.status === 'optimal' ? sensitivities(form, m, q.solution) : [];
    const sigmaW = multiplyVector(S, w);
    const fig: AssetFigures = {
      weights: w,
      sigmaW,
      vols,
      portfolioVol: metrics.volatility,
      riskShares: Float64Array.from(p.assets, (a) => metrics.riskContributions[a]),
      budgets,
      expected,
      corrW: C ? multiplyVector(C, w) : undefined,
      ruleWeights,
      ownThresholds: form && q && q.status === 'optimal' ? computation.thresholds?.(form, q.solution, n) : undefined,
    };
    const phi = q && q.status === 'optimal' ? q.solution.objective : NaN;
    const unpriced: string[] = [];
    const binding = explainBinding(
      m,
      sens,
      {
        ...objectiveDefinition(p.objective.method).shadowPrice,
        ...computation.scale(phi, { S, m, w, form, q, budgets, ruleWeights }),
      },
      unpriced,
    );
    if (unpriced.length > 0)
      flags.push(
        `${unpriced.join(', ')} ${unpriced.length === 1 ? 'binds' : 'bind'} but cannot be priced: the limits that bind at this solution are degenerate`,
      );
    for (const s of sens)
      if (s.item.type === 'inequality' && m.inequalities[s.item.index].kind === 'turnover' && !computation.ruleBased)
        flags.push(`the ${pctText(m.inequalities[s.item.index].limit)} turnover limit binds`);
    return {
      assets: explainAssets((figures, pf) => computation.explainer(p.objective, figures, pf), m, fig, sens),
      binding,
      flags,
    };
  }
}

export function solveCandidate(problem: CandidateProblem): CandidateResult {
  return solveCandidateDetailed(problem).result;
}
