/**
 * From a linear mandate to the QP the solver sees, in two forms.
 *
 * Direct: minimise 1/2 w'Pw + q'w over the mandate (minimum variance, maximum decorrelation,
 * nearest feasible weights to a rule).
 *
 * Homogenised (Charnes and Cooper 1962, Naval Research Logistics Quarterly 9, for linear ratios;
 * Schaible 1974, Zeitschrift fuer Operations Research 18, for convex-concave ratios; both recalled
 * from memory): for a ratio s'w / sqrt(w'Sigma w) over {A w = b, G w <= h, lb <= w <= ub} set
 * y = w / (s'w) and kappa = 1 / (s'w) > 0. Then s'y = 1, A y = b kappa, G y <= h kappa,
 * lb kappa <= y <= ub kappa, and the ratio is 1 / sqrt(y'Sigma y): one convex QP for any affine
 * limits, turnover against current holdings included (its linearisation is affine in w, so it
 * homogenises like the rest). The maximum-diversification property tests and the parametric
 * search in test/unit/optimise check this exactness. Without the numerator row the same cone
 * carries the risk-budgeting problem of erc.ts.
 */
import { zeros, type Matrix } from '../linalg/matrix.js';
import type { LinearMandate, MandateRow } from './mandate.js';
import type { QpProblem, QpSolution, SparseRow } from './qp/index.js';

/** What a QP row or bound stands for in the mandate. */
export type Provenance =
  | { type: 'equality'; index: number }
  | { type: 'inequality'; index: number }
  | { type: 'upper'; variable: number }
  | { type: 'lower'; variable: number }
  | { type: 'numerator' };

export interface Formulation {
  qp: QpProblem;
  form: 'direct' | 'homogenised';
  /** Index of kappa in the homogenised form. */
  kappa: number;
  rowsA: Provenance[];
  rowsG: Provenance[];
}

function embed(P: Matrix, dim: number): Matrix {
  const n = P.rows;
  if (dim === n) return P;
  const out = zeros(dim, dim);
  for (let i = 0; i < n; i++) out.data.set(P.data.subarray(i * n, (i + 1) * n), i * dim);
  return out;
}

export function directForm(m: LinearMandate, P: Matrix, qAssets?: ArrayLike<number>): Formulation {
  const dim = m.variables;
  const q = new Float64Array(dim);
  if (qAssets) for (let i = 0; i < m.assets.length; i++) q[i] = qAssets[i];
  return {
    qp: {
      P: embed(P, dim),
      q,
      A: m.equalities.map((r) => r.row),
      b: Float64Array.from(m.equalities, (r) => r.rhs),
      G: m.inequalities.map((r) => r.row),
      h: Float64Array.from(m.inequalities, (r) => r.rhs),
      lb: m.lb,
      ub: m.ub,
    },
    form: 'direct',
    kappa: -1,
    rowsA: m.equalities.map((_, index) => ({ type: 'equality', index })),
    rowsG: m.inequalities.map((_, index) => ({ type: 'inequality', index })),
  };
}

const withKappa = (r: MandateRow, kappa: number): SparseRow => ({
  idx: [...r.row.idx, kappa],
  val: [...r.row.val, -r.rhs],
});

/** The cone over the mandate; `numerator` (per asset) adds the normalising row s'y = 1. */
export function homogenisedForm(m: LinearMandate, P: Matrix, numerator?: ArrayLike<number>): Formulation {
  const kappa = m.variables;
  const dim = kappa + 1;
  const A: SparseRow[] = [];
  const b: number[] = [];
  const rowsA: Provenance[] = [];
  const G: SparseRow[] = [];
  const rowsG: Provenance[] = [];
  m.equalities.forEach((r, index) => {
    A.push(withKappa(r, kappa));
    b.push(0);
    rowsA.push({ type: 'equality', index });
  });
  if (numerator) {
    const idx: number[] = [];
    const val: number[] = [];
    for (let i = 0; i < m.assets.length; i++)
      if (numerator[i] !== 0) {
        idx.push(i);
        val.push(numerator[i]);
      }
    A.push({ idx, val });
    b.push(1);
    rowsA.push({ type: 'numerator' });
  }
  m.inequalities.forEach((r, index) => {
    G.push(withKappa(r, kappa));
    rowsG.push({ type: 'inequality', index });
  });
  const lb = new Float64Array(dim).fill(-Infinity);
  const ub = new Float64Array(dim).fill(Infinity);
  lb[kappa] = 0;
  for (let i = 0; i < m.variables; i++) {
    // A zero bound stays a bound (0 * kappa = 0); any other finite bound becomes a row.
    if (m.lb[i] === 0) lb[i] = 0;
    else if (Number.isFinite(m.lb[i])) {
      G.push({ idx: [i, kappa], val: [-1, m.lb[i]] });
      rowsG.push({ type: 'lower', variable: i });
    }
    if (m.ub[i] === 0) ub[i] = 0;
    else if (Number.isFinite(m.ub[i])) {
      G.push({ idx: [i, kappa], val: [1, -m.ub[i]] });
      rowsG.push({ type: 'upper', variable: i });
    }
  }
  return {
    qp: {
      P: embed(P, dim),
      q: new Float64Array(dim),
      A,
      b: Float64Array.from(b),
      G,
      h: new Float64Array(G.length),
      lb,
      ub,
    },
    form: 'homogenised',
    kappa,
    rowsA,
    rowsG,
  };
}

/** Weights of the assets from a solution of either form. */
export function weightsOf(f: Formulation, x: Float64Array, n: number): Float64Array {
  if (f.form === 'direct') return x.slice(0, n);
  const k = x[f.kappa];
  const w = new Float64Array(n);
  for (let i = 0; i < n; i++) w[i] = x[i] / k;
  return w;
}

/** out_j += m row_j on the asset entries (j < n) of the row. */
function addOnAssets(out: Float64Array, row: SparseRow, m: number, n: number): void {
  for (let t = 0; t < row.idx.length; t++) if (row.idx[t] < n) out[row.idx[t]] += m * row.val[t];
}

/** A mandate limit and d(QP objective)/d(limit) at the solution, from the multipliers. */
export interface Sensitivity {
  item: { type: 'inequality'; index: number } | { type: 'upper' | 'lower'; variable: number };
  multiplier: number;
  dObjective: number;
}

export function sensitivities(f: Formulation, m: LinearMandate, s: QpSolution): Sensitivity[] {
  const out: Sensitivity[] = [];
  const k = f.form === 'homogenised' ? s.x[f.kappa] : 1;
  for (let r = 0; r < f.rowsG.length; r++) {
    const z = s.z[r];
    if (!(z > 0)) continue;
    const p = f.rowsG[r];
    if (p.type === 'inequality')
      out.push({ item: p, multiplier: z, dObjective: -z * k * m.inequalities[p.index].sign });
    else if (p.type === 'upper') out.push({ item: p, multiplier: z, dObjective: -z * k });
    else if (p.type === 'lower') out.push({ item: p, multiplier: z, dObjective: z * k });
  }
  for (let i = 0; i < m.variables; i++) {
    if (s.zu[i] > 0) out.push({ item: { type: 'upper', variable: i }, multiplier: s.zu[i], dObjective: -s.zu[i] * k });
    if (s.zl[i] > 0) out.push({ item: { type: 'lower', variable: i }, multiplier: s.zl[i], dObjective: s.zl[i] * k });
  }
  return out;
}

/**
 * Each asset's own correlation threshold at a ratio optimum (maximum diversification) when limits
 * bind. Stationarity of the homogenised QP for asset i reads (Sigma y)_i = lambda sigma_i - f_i
 * + (its own bound multipliers), with lambda = y'Sigma y the numerator row's multiplier (sign
 * flipped) and f_i what every other active row (budget, bands, turnover links) exerts on asset
 * i. Dividing by sigma_i sqrt(y'Sigma y) gives its correlation with the portfolio against
 * (lambda sigma_i - f_i) / (sigma_i sqrt(y'Sigma y)): equal for a freely held asset, at least
 * that for one left out, at most for one at its cap. With no limit binding f_i = 0 and every
 * threshold is 1/DR (the property of Choueifaty, Froidure and Reynier 2013); binding limits move
 * each asset's by an amount that depends on its volatility. Derived here from the KKT
 * conditions; undefined for the direct form.
 */
export function ratioThresholds(f: Formulation, s: QpSolution, n: number): Float64Array | undefined {
  if (f.form !== 'homogenised') return undefined;
  const numerator = f.rowsA.findIndex((p) => p.type === 'numerator');
  if (numerator < 0) return undefined;
  const sigma = new Float64Array(n);
  const row = f.qp.A[numerator];
  for (let t = 0; t < row.idx.length; t++) if (row.idx[t] < n) sigma[row.idx[t]] = row.val[t];
  const lambda = -s.y[numerator];
  const yy = 2 * s.objective;
  if (!(yy > 0)) return undefined;
  const force = new Float64Array(n);
  for (let k = 0; k < f.qp.A.length; k++) if (k !== numerator && s.y[k] !== 0) addOnAssets(force, f.qp.A[k], s.y[k], n);
  for (let k = 0; k < f.qp.G.length; k++) {
    const z = s.z[k];
    if (!(z > 0)) continue;
    const p = f.rowsG[k];
    const own = p.type === 'upper' || p.type === 'lower' ? p.variable : -1;
    const r = f.qp.G[k];
    for (let t = 0; t < r.idx.length; t++) {
      const j = r.idx[t];
      if (j < n && j !== own) force[j] += z * r.val[t];
    }
  }
  const root = Math.sqrt(yy);
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = sigma[i] > 0 ? (lambda * sigma[i] - force[i]) / (sigma[i] * root) : NaN;
  return out;
}

/**
 * The same for the direct form (minimum variance, maximum decorrelation): stationarity for asset i
 * reads (P w)_i = -q_i - f_i + (its own bound multipliers), f_i from every active row including
 * the budget, so its beta (P w)_i / w'P w has the threshold (-q_i - f_i) / w'P w: equal when held
 * freely, at least when left out, at most at a cap. With only the budget binding it is 1 for
 * every asset (the first-order condition of minimum variance). Derived here from the KKT
 * conditions; undefined for the homogenised form.
 */
export function directThresholds(f: Formulation, s: QpSolution, n: number): Float64Array | undefined {
  if (f.form !== 'direct') return undefined;
  const dim = f.qp.q.length;
  const x = s.x;
  let xPx = 0;
  for (let i = 0; i < dim; i++) {
    if (x[i] === 0) continue;
    let v = 0;
    for (let j = 0; j < dim; j++) v += f.qp.P.data[i * dim + j] * x[j];
    xPx += x[i] * v;
  }
  if (!(xPx > 0)) return undefined;
  const force = new Float64Array(n);
  for (let k = 0; k < f.qp.A.length; k++) if (s.y[k] !== 0) addOnAssets(force, f.qp.A[k], s.y[k], n);
  for (let k = 0; k < f.qp.G.length; k++) if (s.z[k] > 0) addOnAssets(force, f.qp.G[k], s.z[k], n);
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = (-f.qp.q[i] - force[i]) / xPx;
  return out;
}
