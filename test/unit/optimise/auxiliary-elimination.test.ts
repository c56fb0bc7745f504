import { describe, expect, it } from 'vitest';
import {
  auxiliaryWorkspace,
  factorEliminated,
  planAuxiliaries,
  solveEliminated,
} from '../../../shared-core/optimise/qp/auxiliary-elimination.js';
import { solveEqualityKkt } from '../../../shared-core/optimise/qp/equality-kkt.js';
import { packedRows } from '../../../shared-core/optimise/qp/kernels.js';
import { kktResidual } from '../../../shared-core/optimise/qp/kkt.js';
import { solveQp, type QpProblem, type SparseRow } from '../../../shared-core/optimise/qp/index.js';
import { seededRng } from '../../../shared-core/stability/rng.js';
import { solveEqualityKktSubstituted } from '../../../shared-core/optimise/qp/substitute-two-entry-rows.js';
import { randomCovariance } from './random-problems.js';

/**
 * Minimum variance with a turnover limit (t_i >= |x_i - c_i|, sum t_i <= turnover) and, long-short,
 * a gross-exposure limit (g_i >= |x_i|, sum g_i <= gross), as the mandate layer writes them: the
 * auxiliaries t and g follow the n weights, with no curvature. Invented numbers.
 */
function withAuxiliaries(n: number, seed: number, options: { turnover: number; gross?: number }): QpProblem {
  const rng = seededRng(seed);
  const S = randomCovariance(n, seed, 3, 1, 1);
  const blocks = options.gross !== undefined ? 3 : 2;
  const dim = blocks * n;
  const P = new Float64Array(dim * dim);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) P[i * dim + j] = S.data[i * n + j];
  const current = Array.from({ length: n }, () => rng.next());
  const total = current.reduce((a, b) => a + b, 0);
  const G: SparseRow[] = [];
  const h: number[] = [];
  for (let i = 0; i < n; i++) {
    const c = current[i] / total;
    G.push({ idx: [i, n + i], val: [1, -1] }, { idx: [i, n + i], val: [-1, -1] });
    h.push(c, -c);
  }
  G.push({ idx: Array.from({ length: n }, (_, i) => n + i), val: Array<number>(n).fill(1) });
  h.push(options.turnover);
  if (options.gross !== undefined) {
    for (let i = 0; i < n; i++) {
      G.push({ idx: [i, 2 * n + i], val: [1, -1] }, { idx: [i, 2 * n + i], val: [-1, -1] });
      h.push(0, 0);
    }
    G.push({ idx: Array.from({ length: n }, (_, i) => 2 * n + i), val: Array<number>(n).fill(1) });
    h.push(options.gross);
  }
  const longShort = options.gross !== undefined;
  const lb = new Float64Array(dim);
  const ub = new Float64Array(dim).fill(Infinity);
  for (let i = 0; i < n; i++) {
    lb[i] = longShort ? -0.3 : 0;
    ub[i] = 0.3;
  }
  return {
    P: { rows: dim, cols: dim, data: P },
    q: new Float64Array(dim),
    A: [{ idx: Array.from({ length: n }, (_, i) => i), val: Array<number>(n).fill(1) }],
    b: Float64Array.of(1),
    G,
    h: Float64Array.from(h),
    lb,
    ub,
  };
}

/** The inequality rows as the interior point sees them: G, then one row per finite bound. */
function inequalityRows(p: QpProblem): SparseRow[] {
  const rows = [...p.G];
  p.lb.forEach((v, i) => Number.isFinite(v) && rows.push({ idx: [i], val: [-1] }));
  p.ub.forEach((v, i) => Number.isFinite(v) && rows.push({ idx: [i], val: [1] }));
  return rows;
}

describe('the normal matrix with auxiliary variables eliminated (block elimination, Sherman-Morrison-Woodbury)', () => {
  it('finds the auxiliaries: the weights stay, the turnover and gross-exposure variables go, their sums form the capacitance', () => {
    const n = 12;
    const p = withAuxiliaries(n, 3, { turnover: 0.4, gross: 1.5 });
    const plan = planAuxiliaries(p.P.data, 3 * n, packedRows(inequalityRows(p)))!;
    expect(Array.from(plan.dense)).toEqual([...Array(n).keys()]);
    expect(plan.aux.length).toBe(2 * n);
    expect(plan.limitRows.length).toBe(2);
  });

  it('leaves alone a problem without auxiliaries and a limit that also holds a dense variable (the homogenised scale)', () => {
    const n = 8;
    const p = withAuxiliaries(n, 4, { turnover: 0.4 });
    expect(planAuxiliaries(p.P.data.subarray(0, 0), 0, packedRows([]))).toBeNull();
    const rows = inequalityRows(p);
    const sum = rows[2 * n];
    rows[2 * n] = { idx: [...sum.idx, 0], val: [...sum.val, -0.4] };
    const plan = planAuxiliaries(p.P.data, 2 * n, packedRows(rows));
    expect(plan).toBeNull();
  });

  it('solves H v = f for H = P + R diag(w) R with row weights from 1e-10 to 1e10 (inactive and active rows), to 1e-13 relative (one step of iterative refinement)', () => {
    const n = 20;
    for (const gross of [undefined, 1.4]) {
      const p = withAuxiliaries(n, 7, { turnover: 0.5, gross });
      const dim = p.q.length;
      const rows = inequalityRows(p);
      const R = packedRows(rows);
      const plan = planAuxiliaries(p.P.data, dim, R)!;
      const rng = seededRng(11);
      const w = Float64Array.from(rows, () => 10 ** (20 * rng.next() - 10));
      const factor = auxiliaryWorkspace(plan);
      expect(factorEliminated(plan, factor, w)).toBe(true);
      // H explicitly, and f = H v for a known v.
      const H = Float64Array.from(p.P.data);
      rows.forEach((r, k) =>
        r.idx.forEach((i, a) => r.idx.forEach((j, b) => (H[i * dim + j] += w[k] * r.val[a] * r.val[b]))),
      );
      const v = Float64Array.from({ length: dim }, () => rng.next() - 0.5);
      const f = new Float64Array(dim);
      for (let i = 0; i < dim; i++) for (let j = 0; j < dim; j++) f[i] += H[i * dim + j] * v[j];
      const solved = Float64Array.from(f);
      solveEliminated(plan, factor, solved);
      // Backward error: the residual of the solution against |H| |v|, as a stable solve leaves it.
      for (let i = 0; i < dim; i++) {
        let r = -f[i];
        let scale = 0;
        for (let j = 0; j < dim; j++) {
          r += H[i * dim + j] * solved[j];
          scale += Math.abs(H[i * dim + j] * v[j]);
        }
        expect(Math.abs(r)).toBeLessThan(1e-13 * scale);
      }
    }
  });

  it('minimum variance under binding turnover and gross-exposure limits: optimal, KKT residual below 1e-10, limits held', () => {
    for (let seed = 1; seed <= 12; seed++) {
      const n = 10 + 5 * (seed % 7);
      const gross = seed % 2 === 0 ? 1.2 : undefined;
      const p = withAuxiliaries(n, seed, { turnover: 0.1 + 0.05 * (seed % 5), gross });
      const r = solveQp(p);
      expect(r.status, `seed ${seed}`).toBe('optimal');
      if (r.status !== 'optimal') continue;
      expect(r.kktResidual).toBeLessThan(1e-10);
      expect(kktResidual(p, r.solution)).toBeLessThan(1e-10);
      const x = r.solution.x;
      const turnover = p.G.slice(0, 2 * n).reduce((s, _, k) => (k % 2 ? s : s + Math.abs(x[k / 2] - p.h[k])), 0);
      expect(turnover).toBeLessThanOrEqual(p.h[2 * n] + 1e-9);
      if (gross !== undefined)
        expect(x.slice(0, n).reduce((s, v) => s + Math.abs(v), 0)).toBeLessThanOrEqual(gross + 1e-9);
    }
  });

  it('polishing substitutes an auxiliary on its active link row and gets the same solution and multipliers as the whole system', () => {
    // Active set: the budget, for each asset the link row its auxiliary sits on, the turnover sum.
    const n = 15;
    const p = withAuxiliaries(n, 5, { turnover: 0.3 });
    const rng = seededRng(9);
    const rows = [p.A[0], ...Array.from({ length: n }, (_, i) => p.G[2 * i + (rng.next() < 0.5 ? 0 : 1)]), p.G[2 * n]];
    const s = Float64Array.from(rows, (r) => (r === p.A[0] ? 1 : p.h[p.G.indexOf(r)]));
    const e = { P: p.P.data, n: 2 * n, free: Int32Array.from({ length: 2 * n }, (_, i) => i), C: packedRows(rows) };
    const rhs = Float64Array.from({ length: 2 * n }, () => rng.next() - 0.5);
    const whole = solveEqualityKkt(e, rhs, s)!;
    const substituted = solveEqualityKktSubstituted(e, rhs, s)!;
    const scale = Math.max(...whole.map(Math.abs));
    whole.forEach((v, k) => expect(Math.abs(substituted[k] - v)).toBeLessThan(1e-12 * scale));
  });
});
