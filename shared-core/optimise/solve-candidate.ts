/**
 * One candidate: an objective on an annualised covariance under a mandate, solved exactly, with
 * metrics and explanations. The one function the command line, the app's worker, the memo and
 * walk-forward call, so the figures they show cannot disagree.
 */
import { assetVolatilities, correlationMatrix, effectiveBets } from '../analytics/risk.js';
import { metricsOfWeights } from '../analytics/weights-metrics.js';
import { conditionNumber } from '../linalg/condition.js';
import type { TridiagonalForm } from '../linalg/tridiagonal-form.js';
import { allFinite, identity, multiplyVector, type Matrix } from '../linalg/matrix.js';
import { objectiveDefinition } from '../methods/objective-registry.js';
import type { ObjectiveSpec } from '../scenario/objective-spec.js';
import type { AssetInfo, Constraints } from '../scenario/schema.js';
import { nowMs } from './clock.js';
import { budgetGaps, ercOverCone, ercUnconstrained, ercWeightSensitivity } from './erc.js';
import { solveWithMinimumPosition } from './minimum-position.js';
import { explainAssets, explainBinding, type AssetFigures, type ObjectiveScale } from './explain.js';
import {
  directForm,
  homogenisedForm,
  directThresholds,
  ratioThresholds,
  sensitivities,
  weightsOf,
  type Formulation,
  type Sensitivity,
} from './formulate.js';
import { arithmeticConflicts, describeConflict } from './infeasibility.js';
import { buildMandate, mandateViolation, type LinearMandate } from './mandate.js';
import { addDot, phaseOne, QP_TOLERANCES, solveQp, type QpResult, type QpWarmStart } from './qp/index.js';
import type { CandidateExplanations, CandidateMetrics, CandidateResult, SolvedCandidate } from './result.js';

/** Above this condition number the covariance is treated as singular (common practice for double precision). */
export const CONDITION_LIMIT = 1e12;
/** A rule's weights count as feasible when no limit is broken by more than this. */
export const RULE_FEASIBILITY = 1e-12;

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

const pctText = (v: number): string => `${Number((v * 100).toFixed(2))}%`;

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

/**
 * Which assets to try first when screening: the least correlated with the inverse-volatility
 * portfolio (maximum diversification) or with the lowest covariance with it (minimum variance).
 * Lower is more promising. Undefined below QP_TOLERANCES.screenFrom assets.
 */
function screeningScore(S: Matrix, vols: Float64Array, correlation: boolean): Float64Array | undefined {
  const n = vols.length;
  if (n < QP_TOLERANCES.screenFrom) return undefined;
  const w = new Float64Array(n);
  for (let i = 0; i < n; i++) w[i] = 1 / vols[i];
  // Sigma w, every w_i non-zero: linalg multiplyVector's dense sums, in the solver's own dot
  // product, which the interior point's residuals then find optimised (qp/kernels.ts).
  const score = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const v = addDot(0, S.data, i * n, w, n);
    score[i] = correlation ? v / vols[i] : v;
  }
  return score;
}

function screenPlan(m: LinearMandate, score: Float64Array) {
  const n = m.assets.length;
  if (m.variables !== n) return null; // turnover or gross exposure: no screening
  const candidates: number[] = [];
  for (let i = 0; i < n; i++) if (m.lb[i] === 0) candidates.push(i);
  const order = [...candidates].sort((a, b) => score[a] - score[b]);
  let minCap = 1;
  for (let i = 0; i < n; i++) minCap = Math.min(minCap, m.ub[i]);
  const size = Math.min(
    n,
    Math.max(QP_TOLERANCES.screenInitial, Math.ceil(QP_TOLERANCES.screenPerCap / Math.max(minCap, 1e-3))),
  );
  // Members of a band with a minimum stay in: the band needs them.
  const keep = new Set(order.slice(0, size));
  for (const r of m.inequalities) if (r.kind === 'group-min') for (const i of r.row.idx) keep.add(i);
  return { candidates, keep: [...keep], order };
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
  const method = p.objective.method;
  const riskFreeRate = p.objective.method === 'max-sharpe' ? p.objective.riskFreeRate : undefined;
  const usesCovariance = method !== 'equal-weight' && method !== 'inverse-volatility';
  const covIssue = covarianceProblem(p) ?? (usesCovariance ? conditioningProblem(p) : null);
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
  let ruleWeights: Float64Array | undefined;
  let budgets: Float64Array | undefined;
  let expected: Float64Array | undefined;
  let C: Matrix | undefined;

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

  switch (method) {
    case 'max-diversification':
      runQp(homogenisedForm(m, S, vols), screeningScore(S, vols, true));
      break;
    case 'max-sharpe': {
      const missing = p.assets.filter((a) => p.expectedReturns?.[a] === undefined);
      if (missing.length > 0) return fail('error', `max-sharpe needs expectedReturns for ${missing.join(', ')}`);
      expected = Float64Array.from(p.assets, (a) => p.expectedReturns![a]);
      // The Sharpe ratio (w'mu - rf) / sigma_w is the ratio of the homogenised form with the
      // excess returns mu - rf as numerator, since the budget keeps sum w = 1 (Sharpe 1966).
      const rf = riskFreeRate ?? 0;
      runQp(homogenisedForm(m, S, rf === 0 ? expected : expected.map((v) => v - rf)));
      break;
    }
    case 'min-variance':
      runQp(directForm(m, S), screeningScore(S, vols, false));
      break;
    case 'max-decorrelation':
      C = correlationMatrix(S);
      runQp(directForm(m, C));
      break;
    case 'equal-risk-contribution': {
      const given = p.objective.method === 'equal-risk-contribution' ? p.objective.budgets : undefined;
      budgets = Float64Array.from(p.assets, (a) => (given ? (given[a] ?? 0) : 1));
      const missing = p.assets.filter((_, i) => !(budgets![i] > 0));
      if (missing.length > 0)
        return fail('error', `equal-risk-contribution needs a positive risk budget for ${missing.join(', ')}`);
      const total = budgets.reduce((a, b) => a + b, 0);
      budgets = budgets.map((b) => b / total);
      const free = ercUnconstrained(S, budgets);
      iterations += free.iterations;
      if (!free.ok) return fail('error', `equal risk contribution: ${free.reason}`, iterations);
      if (mandateViolation(m, free.weights) <= RULE_FEASIBILITY) {
        weights = free.weights;
        residual = 0;
        break;
      }
      // Limits cut the risk-parity portfolio: the sequential QP over the mandate cone (erc.ts).
      const cone = homogenisedForm(m, S);
      const lifted = {
        ...m,
        lb: Float64Array.from(m.lb, (v, i) => (i < n ? Math.max(v, Math.min(1e-3, m.ub[i] / 2)) : v)),
      };
      const start = solveQp(
        directForm(
          lifted,
          identity(n),
          free.weights.map((v) => -v),
        ).qp,
      );
      iterations += start.iterations;
      if (start.status === 'infeasible') {
        const plain = solveQp(directForm(m, identity(n)).qp);
        if (plain.status === 'infeasible')
          return fail('infeasible', describeConflict(m, directForm(m, identity(n)), plain.conflict), iterations);
        return fail(
          'error',
          'equal risk contribution needs a feasible portfolio that holds every asset; the limits force some weights to zero',
        );
      }
      if (start.status !== 'optimal')
        return fail('error', `equal risk contribution: no starting point (${start.status})`, iterations);
      const v0 = new Float64Array(cone.qp.q.length);
      v0.set(start.solution.x);
      v0[cone.kappa] = 1;
      const erc = ercOverCone(S, budgets, cone, v0, { warmStart: p.warmStart, shouldCancel: p.shouldCancel });
      iterations += erc.iterations;
      if (!erc.ok) return fail('error', `equal risk contribution: ${erc.reason}`, iterations);
      f = cone;
      qp = erc.lastQp ?? null;
      weights = erc.weights;
      residual = erc.residual;
      warmStart = erc.warmStart;
      flags.push('limits bind, so risk contributions depart from the budgets where a limit forces it');
      break;
    }
    case 'equal-weight':
    case 'inverse-volatility': {
      const raw = method === 'equal-weight' ? new Float64Array(n).fill(1) : Float64Array.from(vols, (v) => 1 / v);
      const total = raw.reduce((a, b) => a + b, 0);
      ruleWeights = raw.map((v) => v / total);
      if (mandateViolation(m, ruleWeights) <= RULE_FEASIBILITY) {
        weights = ruleWeights;
        break;
      }
      runQp(
        directForm(
          m,
          identity(n),
          ruleWeights.map((v) => -v),
        ),
      );
      flags.push(`the limits cut the ${method} rule: the weights are the nearest ones that meet every limit`);
      break;
    }
    default: {
      // A method defined in shared-core/methods/ without its computation here fails the typecheck.
      const unsolved: never = method;
      return fail('error', `no computation for the objective ${String(unsolved)}`);
    }
  }

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
      method === 'max-sharpe'
        ? `no portfolio within the limits has ${riskFreeRate ? `an expected return above the risk-free rate of ${pctText(riskFreeRate)}` : 'a positive expected return'}, so the Sharpe ratio cannot be maximised`
        : 'no portfolio within the limits has a positive diversification ratio',
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
      riskFreeRate,
      corrW: C ? multiplyVector(C, w) : undefined,
      ruleWeights,
      ownThresholds: !(form && q && q.status === 'optimal')
        ? undefined
        : method === 'max-diversification'
          ? ratioThresholds(form, q.solution, n)
          : method === 'min-variance' || method === 'max-decorrelation'
            ? directThresholds(form, q.solution, n)
            : undefined,
    };
    const phi = q && q.status === 'optimal' ? q.solution.objective : NaN;
    const unpriced: string[] = [];
    const binding = explainBinding(
      m,
      sens,
      objectiveScale(method, phi, { S, m, w, form, q, budgets, ruleWeights }),
      unpriced,
    );
    if (unpriced.length > 0)
      flags.push(
        `${unpriced.join(', ')} ${unpriced.length === 1 ? 'binds' : 'bind'} but cannot be priced: the limits that bind at this solution are degenerate`,
      );
    for (const s of sens)
      if (
        s.item.type === 'inequality' &&
        m.inequalities[s.item.index].kind === 'turnover' &&
        method !== 'equal-weight' &&
        method !== 'inverse-volatility'
      )
        flags.push(`the ${pctText(m.inequalities[s.item.index].limit)} turnover limit binds`);
    return { assets: explainAssets(p.objective, m, fig, sens), binding, flags };
  }
}

/** Two largest gaps closer than this (a share of risk) are treated as tied. */
const GAP_TIE = 1e-9;

/**
 * How the solver's multipliers reach the quantity each objective's shadow prices are told in (its
 * definition's `shadowPrice` words).
 * Every one is checked against re-solves with the limit moved in test/unit/optimise/shadow-prices.test.ts.
 */
function objectiveScale(
  method: ObjectiveSpec['method'],
  phi: number,
  at: {
    S: Matrix;
    m: LinearMandate;
    w: Float64Array;
    form: Formulation | null;
    q: QpResult | null;
    budgets?: Float64Array;
    ruleWeights?: Float64Array;
  },
): ObjectiveScale {
  const words = objectiveDefinition(method).shadowPrice;
  switch (method) {
    case 'max-diversification':
    case 'max-sharpe':
      // R = 1 / sqrt(2 phi) (formulate.ts), so dR/dphi = -(2 phi)^(-3/2).
      return {
        ...words,
        maximise: true,
        chain: -Math.pow(2 * phi, -1.5),
      };
    case 'min-variance':
      // sigma_p = sqrt(2 phi): dsigma/dphi = 1 / sigma.
      return {
        ...words,
        maximise: false,
        chain: 1 / Math.sqrt(2 * phi),
        points: true,
      };
    case 'max-decorrelation':
      // phi = w'Cw / 2 with C the correlation matrix; sqrt(w'Cw) is the volatility the portfolio
      // would have if every asset had the same volatility, as a share of it: d sqrt(2 phi)/dphi = 1 / sqrt(2 phi).
      return {
        ...words,
        maximise: false,
        chain: 1 / Math.sqrt(2 * phi),
        points: true,
      };
    case 'equal-risk-contribution': {
      // The risk-budgeting objective F of erc.ts means nothing to a client; its limits are priced
      // by what they do to the largest gap between an asset's share of risk and its budget,
      // through the derivative of the weights in the limit (erc.ts, ercWeightSensitivity).
      const { S, m, w, form, q, budgets } = at;
      const move =
        form && q && q.status === 'optimal' && budgets ? ercWeightSensitivity(S, budgets, form, m, q.solution) : null;
      return {
        ...words,
        maximise: false,
        chain: NaN,
        points: true,
        verbs: ['widen', 'narrow'],
        shadow: (s, loosenUp) => {
          const dw = move?.(s.item);
          if (!dw || !budgets) return undefined;
          const { gap, dGap } = budgetGaps(S, budgets, w, dw);
          let largest = 0;
          for (const g of gap) largest = Math.max(largest, Math.abs(g));
          // The largest of several functions moves, in the loosening direction, as the fastest
          // rising of those tied at the top.
          const dir = loosenUp ? 1 : -1;
          let slope = -Infinity;
          for (let i = 0; i < gap.length; i++)
            if (Math.abs(gap[i]) >= largest - GAP_TIE) slope = Math.max(slope, Math.sign(gap[i]) * dGap[i] * dir);
          return Number.isFinite(slope) ? slope * dir : undefined;
        },
      };
    }
    default: {
      // phi = |w - r|^2 / 2 - |r|^2 / 2; the distance |w - r| has d|w - r|/dphi = 1 / |w - r|.
      const r = at.ruleWeights;
      let d2 = 0;
      if (r) for (let i = 0; i < r.length; i++) d2 += (at.w[i] - r[i]) ** 2;
      return {
        ...words,
        maximise: false,
        chain: 1 / Math.sqrt(d2),
        points: true,
      };
    }
  }
}

export function solveCandidate(problem: CandidateProblem): CandidateResult {
  return solveCandidateDetailed(problem).result;
}
