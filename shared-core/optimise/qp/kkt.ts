/**
 * Residuals of the Karush-Kuhn-Tucker conditions of a QP (see types.ts), relative to the size
 * of the terms they balance, so one number says how exact a point and its multipliers are.
 */
import { multiplyVector } from '../../linalg/matrix.js';
import type { QpProblem, QpSolution, SparseRow } from './types.js';

export function rowDot(row: SparseRow, x: ArrayLike<number>): number {
  let s = 0;
  for (let k = 0; k < row.idx.length; k++) s += row.val[k] * x[row.idx[k]];
  return s;
}

/** out += factor * row (as a dense vector). */
export function addRow(out: Float64Array, row: SparseRow, factor: number): void {
  if (factor === 0) return;
  for (let k = 0; k < row.idx.length; k++) out[row.idx[k]] += factor * row.val[k];
}

/** P x with P n x n (linalg's multiplyVector, which skips the zero entries of x). */
export function symmetricTimes(P: { data: Float64Array; cols: number }, x: ArrayLike<number>, n: number): Float64Array {
  return multiplyVector({ rows: n, cols: n, data: P.data }, x);
}

const infNorm = (v: ArrayLike<number>): number => {
  let m = 0;
  for (let i = 0; i < v.length; i++) m = Math.max(m, Math.abs(v[i]));
  return m;
};

export interface KktParts {
  dual: number;
  primal: number;
  complementarity: number;
  dualSign: number;
}

/** Each part relative to the magnitude of its terms (the usual scaled stopping test of QP solvers). */
export function kktParts(p: QpProblem, s: Omit<QpSolution, 'objective'>): KktParts {
  const n = p.q.length;
  const Px = symmetricTimes(p.P, s.x, n);
  const Aty = new Float64Array(n);
  p.A.forEach((r, i) => addRow(Aty, r, s.y[i]));
  const Gtz = new Float64Array(n);
  p.G.forEach((r, i) => addRow(Gtz, r, s.z[i]));
  const rd = new Float64Array(n);
  for (let i = 0; i < n; i++) rd[i] = Px[i] + p.q[i] + Aty[i] + Gtz[i] - s.zl[i] + s.zu[i];
  const dualScale = Math.max(
    1e-300,
    infNorm(Px),
    infNorm(p.q),
    infNorm(Aty),
    infNorm(Gtz),
    infNorm(s.zl),
    infNorm(s.zu),
  );

  let primal = 0;
  let primalScale = 1;
  let comp = 0;
  p.A.forEach((r, i) => {
    primal = Math.max(primal, Math.abs(rowDot(r, s.x) - p.b[i]));
    primalScale = Math.max(primalScale, Math.abs(p.b[i]));
  });
  p.G.forEach((r, i) => {
    const slack = p.h[i] - rowDot(r, s.x);
    primal = Math.max(primal, -slack);
    primalScale = Math.max(primalScale, Math.abs(p.h[i]));
    comp = Math.max(comp, Math.abs(s.z[i] * slack));
  });
  let sign = 0;
  for (let i = 0; i < n; i++) {
    if (Number.isFinite(p.lb[i])) {
      primal = Math.max(primal, p.lb[i] - s.x[i]);
      comp = Math.max(comp, Math.abs(s.zl[i] * (s.x[i] - p.lb[i])));
    } else sign = Math.max(sign, Math.abs(s.zl[i]));
    if (Number.isFinite(p.ub[i])) {
      primal = Math.max(primal, s.x[i] - p.ub[i]);
      comp = Math.max(comp, Math.abs(s.zu[i] * (p.ub[i] - s.x[i])));
    } else sign = Math.max(sign, Math.abs(s.zu[i]));
    sign = Math.max(sign, -s.zl[i], -s.zu[i]);
  }
  for (let i = 0; i < s.z.length; i++) sign = Math.max(sign, -s.z[i]);
  let xPx = 0;
  let qx = 0;
  for (let i = 0; i < n; i++) {
    xPx += s.x[i] * Px[i];
    qx += p.q[i] * s.x[i];
  }
  return {
    dual: infNorm(rd) / dualScale,
    primal: primal / primalScale,
    complementarity: comp / Math.max(1e-300, Math.abs(xPx) + Math.abs(qx), dualScale * Math.max(1, infNorm(s.x))),
    dualSign: sign / dualScale,
  };
}

export function kktResidual(p: QpProblem, s: Omit<QpSolution, 'objective'>): number {
  const k = kktParts(p, s);
  return Math.max(k.dual, k.primal, k.complementarity, k.dualSign);
}

export function objectiveValue(p: QpProblem, x: ArrayLike<number>): number {
  const n = p.q.length;
  const Px = symmetricTimes(p.P, x, n);
  let v = 0;
  for (let i = 0; i < n; i++) v += x[i] * (0.5 * Px[i] + p.q[i]);
  return v;
}
