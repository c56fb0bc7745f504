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
import type { AssetAt, AssetWords, PortfolioFigures } from './objectives/computation.js';
import type { AssetExplanation, BindingConstraint } from './result.js';
import type { LinearMandate } from './mandate.js';
import type { Sensitivity } from './formulate.js';

export const pct = (v: number, digits = 1): string => `${(v * 100).toFixed(digits)}%`;
export const num = (v: number, digits = 2): string => v.toFixed(digits);
/** A percentage with at most two decimals and no trailing zeros: "2.5%". */
export const pctText = (v: number): string => `${Number((v * 100).toFixed(2))}%`;
/** A weight this close to a limit is at it. */
export const AT_LIMIT = 1e-9;

export interface AssetFigures {
  weights: Float64Array;
  /** Sigma w */
  sigmaW: Float64Array;
  vols: Float64Array;
  portfolioVol: number;
  riskShares: Float64Array;
  budgets?: Float64Array;
  expected?: Float64Array;
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
export const SAME_FIGURE = 1e-6;
/** An asset's own threshold this far from 1/DR is told (half a unit of the two decimals shown). */
export const MOVED_THRESHOLD = 0.005;

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

/**
 * Each asset's reason for its weight: where it sits against its limits (shared by every
 * objective), then its objective's sentence and figures (`explainer`, from the objective's
 * computation in objectives/).
 */
export function explainAssets(
  explainer: (fig: AssetFigures, portfolio: PortfolioFigures) => (i: number, at: AssetAt) => AssetWords,
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
  // Portfolio-wide figures, the same for every asset: computed once.
  const words = explainer(fig, { n, dr, variance, withoutDr: `1/DR = ${num(1 / dr)} without them` });
  const out: AssetExplanation[] = [];
  for (let i = 0; i < n; i++) {
    const asset = m.assets[i];
    const rho = fig.sigmaW[i] / (fig.vols[i] * fig.portfolioVol);
    const atUpper = Number.isFinite(m.ub[i]) && w[i] >= m.ub[i] - AT_LIMIT;
    const atLower = Number.isFinite(m.lb[i]) && w[i] <= m.lb[i] + AT_LIMIT;
    const out0 = atLower && m.lb[i] === 0;
    const capWord = m.upperSource[i] === 'liquidity-cap' ? 'liquidity cap' : 'cap';
    const band = inBand.get(i);
    const reason = atUpper
      ? 'at-upper-bound'
      : out0
        ? 'excluded'
        : atLower
          ? 'at-lower-bound'
          : band !== undefined
            ? 'group-limit'
            : 'held';
    const base = { asset, weight: w[i], reason, ...(band !== undefined ? { limitBinding: band } : {}) };
    const tail = reason === 'group-limit' ? `, away from it because ${band}` : '';
    // Left out although its own figure says it would be held: some other limit keeps it out.
    const keptOut =
      band !== undefined
        ? `, but ${band} and keeps it out`
        : ', but the limits that bind elsewhere in the mandate keep it out';
    const { text, measure, threshold } = words(i, { reason, rho, capWord, band, tail, keptOut });
    out.push({
      ...base,
      text,
      correlationWithPortfolio: rho,
      ...(measure !== undefined ? { measure, threshold } : {}),
    });
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
