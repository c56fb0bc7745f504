/**
 * Explanations an advisor can repeat: per asset, why it is held at its weight or left out, from
 * the optimality conditions; per binding limit, its shadow price from the solver's multipliers
 * in a unit an advisor can repeat: the diversification ratio, the Sharpe ratio, volatility,
 * volatility from correlations alone, the distance from a rule's weights, or (equal risk
 * contribution) the largest gap between an asset's share of risk and its budget. Each is checked
 * against re-solves with the limit moved in test/unit/optimise/shadow-prices.test.ts.
 *
 * Maximum diversification (Choueifaty, Froidure and Reynier 2013, J. Portfolio Management,
 * "Properties of the most diversified portfolio"): at the optimum every held asset not at a limit
 * has correlation exactly 1/DR with the portfolio, every asset left out at least 1/DR, an asset at
 * its cap at most 1/DR. That holds with no limit binding but the budget and long-only; binding
 * caps, bands or turnover move each asset's threshold by an amount that depends on its
 * volatility (formulate.ts ratioThresholds, from the multipliers), and then each asset is told
 * its own, which it meets exactly. Minimum variance (first-order conditions, common practice): every held
 * asset has beta 1 to the portfolio, an excluded asset at least 1, a capped one at most 1.
 */
import type { ObjectiveSpec } from '../scenario/objective-spec.js';
import type { AssetExplanation, BindingConstraint } from './result.js';
import type { LinearMandate } from './mandate.js';
import type { Sensitivity } from './formulate.js';

const pct = (v: number, digits = 1): string => `${(v * 100).toFixed(digits)}%`;
const num = (v: number, digits = 2): string => v.toFixed(digits);
const AT_LIMIT = 1e-9;

export interface AssetFigures {
  weights: Float64Array;
  /** Sigma w */
  sigmaW: Float64Array;
  vols: Float64Array;
  portfolioVol: number;
  riskShares: Float64Array;
  budgets?: Float64Array;
  expected?: Float64Array;
  /** Annualised risk-free rate of the Sharpe ratio (max-sharpe's option), when given. */
  riskFreeRate?: number;
  /** Correlation-matrix product C w and w'Cw for maximum decorrelation. */
  corrW?: Float64Array;
  ruleWeights?: Float64Array;
  /**
   * Each asset's threshold with the binding limits counted: its correlation's for maximum
   * diversification (formulate.ts ratioThresholds), its beta's for minimum variance and maximum
   * decorrelation (directThresholds).
   */
  ownThresholds?: Float64Array;
}

/** Figures this close to their threshold count as on it (the optimum meets it to solver accuracy). */
const SAME_FIGURE = 1e-6;
/** An asset's own threshold this far from 1/DR is told (half a unit of the two decimals shown). */
const MOVED_THRESHOLD = 0.005;

/** Assets that sit in a binding band, turnover or gross-exposure limit (their first-order condition moves). */
function assetsInBindingRows(m: LinearMandate, binding: Sensitivity[]): Map<number, string> {
  const out = new Map<number, string>();
  for (const s of binding) {
    if (s.item.type !== 'inequality') continue;
    const r = m.inequalities[s.item.index];
    const what =
      r.kind === 'group-max' || r.kind === 'group-min'
        ? `the ${r.name} band binds`
        : r.kind === 'illiquid-max'
          ? 'the illiquid cap binds'
          : r.kind === 'turnover' || r.kind === 'turnover-link'
            ? 'the turnover limit binds'
            : 'the gross-exposure limit binds';
    if (r.kind === 'turnover' || r.kind === 'gross-exposure' || r.kind === 'turnover-link' || r.kind === 'gross-link') {
      for (let i = 0; i < m.assets.length; i++) if (!out.has(i)) out.set(i, what);
    } else for (const i of r.row.idx) if (i < m.assets.length && !out.has(i)) out.set(i, what);
  }
  return out;
}

export function explainAssets(
  objective: ObjectiveSpec,
  m: LinearMandate,
  fig: AssetFigures,
  binding: Sensitivity[],
): AssetExplanation[] {
  const n = m.assets.length;
  const w = fig.weights;
  let wsig = 0;
  for (let i = 0; i < n; i++) wsig += w[i] * fig.vols[i];
  const dr = wsig / fig.portfolioVol;
  const variance = fig.portfolioVol * fig.portfolioVol;
  const inBand = assetsInBindingRows(m, binding);
  // Portfolio-wide figures, the same for every asset: computed once, with the sums the per-asset
  // text used to make for each asset.
  const portfolioFigures = {
    withoutDr: `1/DR = ${num(1 / dr)} without them`,
    wcw: 0,
    muP: 0,
  };
  if (objective.method === 'max-decorrelation' && fig.corrW)
    for (let k = 0; k < n; k++) portfolioFigures.wcw += w[k] * fig.corrW[k];
  if (objective.method === 'max-sharpe')
    for (let k = 0; k < n; k++) portfolioFigures.muP += w[k] * (fig.expected ? fig.expected[k] : 0);
  const out: AssetExplanation[] = [];
  for (let i = 0; i < n; i++) {
    const asset = m.assets[i];
    const rho = fig.sigmaW[i] / (fig.vols[i] * fig.portfolioVol);
    const atUpper = Number.isFinite(m.ub[i]) && w[i] >= m.ub[i] - AT_LIMIT;
    const atLower = Number.isFinite(m.lb[i]) && w[i] <= m.lb[i] + AT_LIMIT;
    const out0 = atLower && m.lb[i] === 0;
    const capWord = m.upperSource[i] === 'liquidity-cap' ? 'liquidity cap' : 'cap';
    const reason = atUpper
      ? 'at-upper-bound'
      : out0
        ? 'excluded'
        : atLower
          ? 'at-lower-bound'
          : inBand.has(i)
            ? 'group-limit'
            : 'held';
    const base = { asset, weight: w[i], reason, ...(inBand.has(i) ? { limitBinding: inBand.get(i) } : {}) };
    const tail = reason === 'group-limit' ? `, away from it because ${inBand.get(i)}` : '';
    // Left out although its own figure says it would be held: some other limit keeps it out.
    const keptOut = inBand.has(i)
      ? `, but ${inBand.get(i)} and keeps it out`
      : ', but the limits that bind elsewhere in the mandate keep it out';
    switch (objective.method) {
      case 'max-diversification': {
        const t = 1 / dr;
        const own = fig.ownThresholds?.[i];
        if (own !== undefined && Number.isFinite(own) && Math.abs(own - t) > MOVED_THRESHOLD) {
          // Binding limits move this asset's threshold away from 1/DR (formulate.ts ratioThresholds):
          // say its own, which its correlation meets exactly as the optimality conditions require.
          const without = portfolioFigures.withoutDr;
          const c = `correlation ${num(rho)} with the portfolio`;
          const text =
            reason === 'at-upper-bound'
              ? `held at its ${capWord} of ${pct(w[i])}: ${c}, at or below its threshold of ${num(own)} once the binding limits are counted (${without}); it would be held more without the ${capWord}`
              : reason === 'excluded'
                ? own < -1
                  ? `left out: ${c}; once the binding limits are counted, an asset of its volatility (${pct(fig.vols[i])}) would need a correlation below ${num(own)}, which no asset can have (${without})`
                  : `left out: ${c}, at or above its threshold of ${num(own)} once the binding limits are counted (${without})${inBand.has(i) ? `; ${inBand.get(i)}` : ''}; under these limits an asset this correlated and this volatile adds less diversification than it costs`
                : reason === 'at-lower-bound'
                  ? `held at its floor of ${pct(w[i])}: ${c}, at or above its threshold of ${num(own)} once the binding limits are counted (${without}); it would be held less without the floor`
                  : `held at ${pct(w[i])}: ${c}, equal to its threshold once the binding limits are counted (${without})${tail}`;
          out.push({ ...base, text, correlationWithPortfolio: rho, measure: rho, threshold: own });
          break;
        }
        const c = `correlation ${num(rho)} with the portfolio, threshold 1/DR = ${num(t)}`;
        const text =
          reason === 'at-upper-bound'
            ? `held at its ${capWord} of ${pct(w[i])}: ${c}; below the threshold, it would be held more without the ${capWord}`
            : reason === 'excluded'
              ? rho >= t - SAME_FIGURE
                ? `left out: ${c}; an asset this correlated with the portfolio adds less diversification than it costs`
                : `left out: ${c}; below the threshold it would be held${keptOut}`
              : reason === 'at-lower-bound'
                ? `held at its floor of ${pct(w[i])}: ${c}; above the threshold, it would be held less without the floor`
                : `held at ${pct(w[i])}: ${c}${tail}`;
        out.push({ ...base, text, correlationWithPortfolio: rho, measure: rho, threshold: t });
        break;
      }
      case 'min-variance':
      case 'max-decorrelation': {
        const dec = objective.method === 'max-decorrelation' && fig.corrW;
        const wcw = portfolioFigures.wcw;
        const beta = dec ? fig.corrW![i] / wcw : fig.sigmaW[i] / variance;
        const what = dec ? 'beta to the portfolio on the correlation matrix' : 'beta to the portfolio';
        const own = fig.ownThresholds?.[i];
        if (own !== undefined && Number.isFinite(own) && Math.abs(own - 1) > MOVED_THRESHOLD) {
          // Binding limits move this asset's threshold away from 1 (formulate.ts directThresholds).
          const b = `${what} ${num(beta)}`;
          const without = '1 without them';
          const text =
            reason === 'at-upper-bound'
              ? `held at its ${capWord} of ${pct(w[i])}: ${b}, at or below its threshold of ${num(own)} once the binding limits are counted (${without}); it would be held more without the ${capWord}`
              : reason === 'excluded'
                ? `left out: ${b}, at or above its threshold of ${num(own)} once the binding limits are counted (${without})${inBand.has(i) ? `; ${inBand.get(i)}` : ''}; under these limits adding it would not lower risk`
                : reason === 'at-lower-bound'
                  ? `held at its floor of ${pct(w[i])}: ${b}, at or above its threshold of ${num(own)} once the binding limits are counted (${without}); it would be held less without the floor`
                  : `held at ${pct(w[i])}: ${b}, equal to its threshold once the binding limits are counted (${without})${tail}`;
          out.push({ ...base, text, correlationWithPortfolio: rho, measure: beta, threshold: own });
          break;
        }
        const text =
          reason === 'at-upper-bound'
            ? `held at its ${capWord} of ${pct(w[i])}: ${what} ${num(beta)}, below 1, so it would be held more without the ${capWord}`
            : reason === 'excluded'
              ? beta >= 1 - SAME_FIGURE
                ? `left out: ${what} ${num(beta)}, at least 1, so adding it would not lower risk`
                : `left out: ${what} ${num(beta)}, below 1, so it would lower risk${keptOut}`
              : reason === 'at-lower-bound'
                ? `held at its floor of ${pct(w[i])}: ${what} ${num(beta)}, above 1`
                : `held at ${pct(w[i])}: ${what} ${num(beta)}; at the minimum every freely held asset has beta 1${tail}`;
        out.push({ ...base, text, correlationWithPortfolio: rho, measure: beta, threshold: 1 });
        break;
      }
      case 'equal-risk-contribution': {
        const b = fig.budgets ? fig.budgets[i] : 1 / n;
        const text = `held at ${pct(w[i])}: risk contribution ${pct(fig.riskShares[i])} against a budget of ${pct(b)}${
          reason === 'held'
            ? ''
            : reason === 'group-limit'
              ? tail
              : ` (at its ${reason === 'at-upper-bound' ? capWord : 'floor'})`
        }`;
        out.push({ ...base, text, correlationWithPortfolio: rho, measure: fig.riskShares[i], threshold: b });
        break;
      }
      case 'max-sharpe': {
        const mu = fig.expected ? fig.expected[i] : 0;
        const muP = portfolioFigures.muP;
        // Held assets earn rf + beta_i (mu_P - rf), beta_i = (Sigma w)_i / w'Sigma w (first-order
        // conditions of the tangency portfolio).
        const beta = fig.sigmaW[i] / variance;
        const rf = fig.riskFreeRate;
        const need = rf === undefined ? beta * muP : rf + beta * (muP - rf);
        const c = `expected return ${pct(mu, 2)} against ${pct(need, 2)} asked by its beta to the portfolio`;
        const text =
          reason === 'at-upper-bound'
            ? `held at its ${capWord} of ${pct(w[i])}: ${c}; it would be held more without the ${capWord}`
            : reason === 'excluded'
              ? mu <= need + SAME_FIGURE
                ? `left out: ${c}; it does not pay for the risk it adds`
                : `left out: ${c}; it would pay for its risk${keptOut}`
              : `held at ${pct(w[i])}: ${c}${tail}`;
        out.push({ ...base, text, correlationWithPortfolio: rho, measure: mu, threshold: need });
        break;
      }
      default: {
        const r = fig.ruleWeights ? fig.ruleWeights[i] : w[i];
        const moved = Math.abs(r - w[i]) > AT_LIMIT;
        const rule = objective.method === 'equal-weight' ? 'equal weight' : 'inverse-volatility weight';
        const text = moved
          ? `held at ${pct(w[i])} instead of its ${rule} of ${pct(r)}: the nearest weights that meet the limits`
          : `held at its ${rule} of ${pct(w[i])}${objective.method === 'inverse-volatility' ? ` (volatility ${pct(fig.vols[i])})` : ''}`;
        out.push({ ...base, text, correlationWithPortfolio: rho });
      }
    }
  }
  return out;
}

export interface ObjectiveScale {
  /** What the objective is called in the text, e.g. 'DR'. */
  name: string;
  unit: string;
  /** True when a higher value is better. */
  maximise: boolean;
  /** d(objective)/d(QP objective value) at the solution. */
  chain: number;
  /**
   * When set, replaces chain * dObjective: d(objective)/d(limit) taken in the direction that
   * loosens the limit (`loosenUp`: a cap or maximum rises, a floor or minimum falls); undefined
   * when it cannot be measured (a degenerate solution), and the limit is then left out.
   */
  shadow?: (s: Sensitivity, loosenUp: boolean) => number | undefined;
  /** The objective is a share (volatility, a share of risk, a distance between weights): changes are told in percentage points. */
  points?: boolean;
  /** Verbs for a rise and a fall of the objective; 'raise' and 'lower' when absent. */
  verbs?: readonly [string, string];
}

/** Binding limits with shadow prices: dObjective/dLimit per unit (1.00 = 100 points) of the limit. */
/**
 * Binding limits with their prices; `unpriced` names the binding limits whose price the solution
 * does not determine (a degenerate set of limits at the optimum, where the derivative of the
 * weights does not exist), so that they are flagged rather than left out in silence.
 */
export function explainBinding(
  m: LinearMandate,
  sens: Sensitivity[],
  scale: ObjectiveScale,
  unpriced: string[] = [],
): BindingConstraint[] {
  const out: BindingConstraint[] = [];
  for (const s of sens) {
    let label: string;
    let limit: number;
    let kindUpper: boolean;
    if (s.item.type === 'inequality') {
      const r = m.inequalities[s.item.index];
      if (r.kind === 'turnover-link' || r.kind === 'gross-link') continue;
      limit = r.limit;
      kindUpper = r.sign === 1;
      label =
        r.kind === 'group-max'
          ? `${r.name} band maximum`
          : r.kind === 'group-min'
            ? `${r.name} band minimum`
            : r.kind === 'illiquid-max'
              ? 'illiquid cap'
              : r.kind === 'turnover'
                ? 'turnover limit'
                : 'gross-exposure limit';
    } else {
      const i = s.item.variable;
      if (i >= m.assets.length) continue;
      if (s.item.type === 'lower' && m.lb[i] === 0) continue; // explained per asset
      kindUpper = s.item.type === 'upper';
      limit = kindUpper ? m.ub[i] : m.lb[i];
      label = kindUpper
        ? `${m.upperSource[i] === 'liquidity-cap' ? 'liquidity cap' : 'cap'} on ${m.assets[i]}`
        : `floor on ${m.assets[i]}`;
    }
    const shadow = scale.shadow ? scale.shadow(s, kindUpper) : scale.chain * s.dObjective;
    if (shadow === undefined || !Number.isFinite(shadow)) {
      unpriced.push(`${label} ${pct(limit)}`);
      continue;
    }
    if (!(Math.abs(shadow) > 0)) continue;
    const step = kindUpper ? 0.01 : -0.01;
    const change = shadow * step;
    const better = scale.maximise ? change > 0 : change < 0;
    const [up, down] = scale.verbs ?? ['raise', 'lower'];
    const verb = `${change > 0 ? up : down} ${scale.name}`;
    const size = scale.points
      ? `${(Math.abs(change) * 100).toPrecision(2)} percentage points`
      : Math.abs(change).toPrecision(2);
    const text = `${kindUpper ? 'raising' : 'lowering'} the ${label} from ${pct(limit)} to ${pct(limit + step)} would ${verb} by about ${size}${better ? '' : ' (a cost)'}`;
    out.push({ constraint: `${label} ${pct(limit)}`, shadowPrice: shadow, objectiveUnit: scale.unit, text });
  }
  return out;
}
