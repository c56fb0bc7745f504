/**
 * The npm package quadprog 1.6.1 (Goldfarb and Idnani 1983, Math. Programming 27, ported from
 * R's quadprog by A. Santini) as an independent reference for our QP solver. It solves
 * min -d'x + 1/2 x'Dx s.t. A'x >= b0 (first meq rows equalities), 1-based arrays.
 */
import quadprog from 'quadprog';
import type { QpProblem } from '../../../shared-core/optimise/qp/index.js';

export interface ReferenceResult {
  x: Float64Array | null;
  message: string;
}

export function solveWithQuadprog(p: QpProblem): ReferenceResult {
  const n = p.q.length;
  const D: number[][] = [[]];
  for (let i = 0; i < n; i++) {
    const row = [0];
    for (let j = 0; j < n; j++) row.push(p.P.data[i * n + j]);
    D.push(row);
  }
  const d = [0, ...Array.from(p.q, (v) => -v)];
  const cols: { a: Float64Array; b: number }[] = [];
  const dense = (idx: readonly number[], val: readonly number[], sign: number) => {
    const a = new Float64Array(n);
    idx.forEach((i, t) => (a[i] += sign * val[t]));
    return a;
  };
  p.A.forEach((r, j) => cols.push({ a: dense(r.idx, r.val, 1), b: p.b[j] }));
  p.G.forEach((r, j) => cols.push({ a: dense(r.idx, r.val, -1), b: -p.h[j] }));
  for (let i = 0; i < n; i++) {
    if (Number.isFinite(p.lb[i])) cols.push({ a: dense([i], [1], 1), b: p.lb[i] });
    if (Number.isFinite(p.ub[i])) cols.push({ a: dense([i], [1], -1), b: -p.ub[i] });
  }
  const A: number[][] = [[]];
  for (let i = 0; i < n; i++) A.push([0, ...cols.map((c) => c.a[i])]);
  const b0 = [0, ...cols.map((c) => c.b)];
  const res = quadprog.solveQP(D, d, A, b0, p.A.length);
  if (res.message) return { x: null, message: res.message };
  return { x: Float64Array.from(res.solution.slice(1)), message: '' };
}
