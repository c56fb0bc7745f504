/**
 * Phase one: the least total violation of the constraints, with the bounds kept hard,
 *
 *   minimise sum(t) + eps/2 |x|^2  s.t.  A x - b = t+ - t-,  G x - h <= tG,  lb <= x <= ub,  t >= 0.
 *
 * The elastic problem is always feasible. A positive minimum proves the original constraints
 * inconsistent, and the rows and bounds with non-zero multipliers are the ones that conflict
 * (a Farkas certificate: a non-negative combination of them is contradictory).
 */
import { zeros } from '../../linalg/matrix.js';
import type { CancelCheck } from '../../stability/cancel.js';
import { interiorPoint } from './interior-point.js';
import { QP_TOLERANCES, type QpConflict, type QpProblem, type SparseRow } from './types.js';

export interface PhaseOneResult {
  feasible: boolean;
  conflict: QpConflict;
  x: Float64Array;
  iterations: number;
}

/** A true `shouldCancel` throws CancelledError (stability/cancel.ts). */
export function phaseOne(p: QpProblem, shouldCancel?: CancelCheck): PhaseOneResult {
  const n = p.q.length;
  const me = p.A.length;
  const mi = p.G.length;
  const nt = 2 * me + mi;
  const dim = n + nt;
  const P = zeros(dim, dim);
  for (let i = 0; i < n; i++) P.data[i * dim + i] = QP_TOLERANCES.phaseOneProximal;
  const q = new Float64Array(dim);
  for (let k = n; k < dim; k++) q[k] = 1;
  const A: SparseRow[] = p.A.map((r, j) => ({
    idx: [...r.idx, n + 2 * j, n + 2 * j + 1],
    val: [...r.val, -1, 1],
  }));
  const G: SparseRow[] = p.G.map((r, j) => ({ idx: [...r.idx, n + 2 * me + j], val: [...r.val, -1] }));
  const lb = new Float64Array(dim);
  const ub = new Float64Array(dim).fill(Infinity);
  lb.set(p.lb);
  ub.set(p.ub);
  const out = interiorPoint(
    { P, q, A, b: p.b, G, h: p.h, lb, ub },
    { tolerance: 1e-10, maxIterations: QP_TOLERANCES.maxIterations, shouldCancel, middleStart: true },
  );
  const x = out.solution.x;
  let violation = 0;
  for (let k = n; k < dim; k++) violation += Math.max(0, x[k]);
  let scale = 1;
  for (const v of p.b) scale = Math.max(scale, Math.abs(v));
  for (const v of p.h) scale = Math.max(scale, Math.abs(v));
  const feasible = violation / scale <= QP_TOLERANCES.infeasibility;
  const conflict: QpConflict = { rowsA: [], rowsG: [], lower: [], upper: [], violation };
  if (!feasible) {
    out.solution.y.forEach((v, j) => Math.abs(v) > QP_TOLERANCES.phaseOneCertificate && conflict.rowsA.push(j));
    out.solution.z.forEach((v, j) => v > QP_TOLERANCES.phaseOneCertificate && conflict.rowsG.push(j));
    for (let i = 0; i < n; i++) {
      if (out.solution.zl[i] > QP_TOLERANCES.phaseOneCertificate) conflict.lower.push(i);
      if (out.solution.zu[i] > QP_TOLERANCES.phaseOneCertificate) conflict.upper.push(i);
    }
  }
  return { feasible, conflict, x: x.slice(0, n), iterations: out.iterations };
}
