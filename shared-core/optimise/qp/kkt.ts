/**
 * Residuals of the Karush-Kuhn-Tucker conditions of a QP (see types.ts), relative to the size
 * of the terms they balance, so one number says how exact a point and its multipliers are.
 */
import { addRowsTimes, maxAbs, packedRows, rowsTimes, timesVector } from './kernels.js';
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

/** P x with P n x n (kernels.ts timesVector: only the non-zero entries of a sparse x are visited). */
export function symmetricTimes(P: { data: Float64Array }, x: Float64Array, n: number): Float64Array {
  return timesVector(P.data, n, x);
}

export interface KktParts {
  dual: number;
  primal: number;
  complementarity: number;
  dualSign: number;
}

/**
 * Each part relative to the magnitude of its terms (the usual scaled stopping test of QP solvers).
 * `Px` is P x when the caller has it already (polishing does).
 */
export function kktParts(
  p: QpProblem,
  s: Omit<QpSolution, 'objective'>,
  Px = symmetricTimes(p.P, s.x, p.q.length),
): KktParts {
  const n = p.q.length;
  const A = packedRows(p.A);
  const G = packedRows(p.G);
  const Aty = new Float64Array(n);
  addRowsTimes(A, s.y, Aty);
  const Gtz = new Float64Array(n);
  addRowsTimes(G, s.z, Gtz);
  const rd = new Float64Array(n);
  for (let i = 0; i < n; i++) rd[i] = Px[i] + p.q[i] + Aty[i] + Gtz[i] - s.zl[i] + s.zu[i];
  const dualScale = Math.max(1e-300, maxAbs(Px), maxAbs(p.q), maxAbs(Aty), maxAbs(Gtz), maxAbs(s.zl), maxAbs(s.zu));

  let primal = 0;
  let primalScale = 1;
  let comp = 0;
  const Ax = new Float64Array(p.A.length);
  rowsTimes(A, s.x, Ax);
  const Gx = new Float64Array(p.G.length);
  rowsTimes(G, s.x, Gx);
  for (let i = 0; i < p.A.length; i++) {
    primal = Math.max(primal, Math.abs(Ax[i] - p.b[i]));
    primalScale = Math.max(primalScale, Math.abs(p.b[i]));
  }
  for (let i = 0; i < p.G.length; i++) {
    const slack = p.h[i] - Gx[i];
    primal = Math.max(primal, -slack);
    primalScale = Math.max(primalScale, Math.abs(p.h[i]));
    comp = Math.max(comp, Math.abs(s.z[i] * slack));
  }
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
    dual: maxAbs(rd) / dualScale,
    primal: primal / primalScale,
    complementarity: comp / Math.max(1e-300, Math.abs(xPx) + Math.abs(qx), dualScale * Math.max(1, maxAbs(s.x))),
    dualSign: sign / dualScale,
  };
}

export function kktResidual(p: QpProblem, s: Omit<QpSolution, 'objective'>, Px?: Float64Array): number {
  const k = kktParts(p, s, Px);
  return Math.max(k.dual, k.primal, k.complementarity, k.dualSign);
}
