import { describe, expect, it } from 'vitest';
import { fromRows } from '../../../shared-core/linalg/matrix.js';
import { rowDot } from '../../../shared-core/optimise/qp/kkt.js';
import { phaseOne } from '../../../shared-core/optimise/qp/phase-one.js';
import { solveQp } from '../../../shared-core/optimise/qp/solve-qp.js';
import type { QpProblem } from '../../../shared-core/optimise/qp/types.js';
import { solveWithQuadprog } from './quadprog-reference.js';
import { randomQp } from './random-problems.js';

function maxViolation(p: QpProblem, x: Float64Array): number {
  let v = 0;
  p.A.forEach((r, j) => (v = Math.max(v, Math.abs(rowDot(r, x) - p.b[j]))));
  p.G.forEach((r, j) => (v = Math.max(v, rowDot(r, x) - p.h[j])));
  for (let i = 0; i < x.length; i++) v = Math.max(v, p.lb[i] - x[i], x[i] - p.ub[i]);
  return v;
}

describe('dense convex QP solver', () => {
  it('agrees with npm quadprog 1.6.1 (Goldfarb-Idnani dual method) on 300 random problems to 1e-7', () => {
    let compared = 0;
    for (let seed = 1; seed <= 300; seed++) {
      const n = 4 + (seed % 37);
      const p = randomQp(n, seed, { groups: seed % 4, linear: seed % 3 === 0 });
      const ours = solveQp(p);
      const ref = solveWithQuadprog(p);
      if (ref.x === null) {
        // quadprog reports inconsistent constraints: we must say infeasible too.
        expect(ours.status, `seed ${seed}`).toBe('infeasible');
        continue;
      }
      expect(ours.status, `seed ${seed}`).toBe('optimal');
      if (ours.status !== 'optimal') continue;
      compared++;
      for (let i = 0; i < n; i++)
        expect(Math.abs(ours.solution.x[i] - ref.x[i]), `seed ${seed} x${i}`).toBeLessThan(1e-7);
      expect(ours.kktResidual).toBeLessThan(1e-10);
      expect(maxViolation(p, ours.solution.x)).toBeLessThan(1e-9);
    }
    expect(compared).toBeGreaterThan(250);
  });

  it('reports a relative KKT residual below 1e-10 and restarts from a warm start in one solve', () => {
    const p = randomQp(60, 4242, { groups: 3 });
    const cold = solveQp(p);
    expect(cold.status).toBe('optimal');
    if (cold.status !== 'optimal') return;
    expect(cold.kktResidual).toBeLessThan(1e-10);
    const warm = solveQp(p, { warmStart: cold.warmStart });
    expect(warm.path).toBe('warm-start');
    expect(warm.iterations).toBe(1);
    if (warm.status === 'optimal')
      for (let i = 0; i < 60; i++) expect(warm.solution.x[i]).toBeCloseTo(cold.solution.x[i], 12);
  });

  it('a wrong warm start is repaired, not trusted', () => {
    const p = randomQp(30, 77, { groups: 2 });
    const cold = solveQp(p);
    const warm = solveQp(p, { warmStart: { activeRows: [], atLower: [0, 1, 2, 3, 4, 5], atUpper: [] } });
    expect(warm.status).toBe('optimal');
    if (cold.status === 'optimal' && warm.status === 'optimal')
      for (let i = 0; i < 30; i++) expect(Math.abs(warm.solution.x[i] - cold.solution.x[i])).toBeLessThan(1e-9);
  });

  it('names the conflicting constraints of an infeasible problem and phase one confirms it', () => {
    // Budget sum x = 1 with x_i <= 0.2 on four variables: the bounds add to 80%.
    const n = 4;
    const p: QpProblem = {
      P: fromRows([
        [1, 0, 0, 0],
        [0, 1, 0, 0],
        [0, 0, 1, 0],
        [0, 0, 0, 1],
      ]),
      q: new Float64Array(n),
      A: [{ idx: [0, 1, 2, 3], val: [1, 1, 1, 1] }],
      b: Float64Array.of(1),
      G: [{ idx: [0], val: [1] }],
      h: Float64Array.of(0.5),
      lb: new Float64Array(n),
      ub: new Float64Array(n).fill(0.2),
    };
    const r = solveQp(p);
    expect(r.status).toBe('infeasible');
    if (r.status !== 'infeasible') return;
    expect(r.conflict.rowsA).toEqual([0]);
    expect(r.conflict.upper).toEqual([0, 1, 2, 3]);
    expect(r.conflict.rowsG).toEqual([]);
    expect(r.conflict.violation).toBeCloseTo(0.2, 8);
    expect(phaseOne(p).feasible).toBe(false);
    expect(solveWithQuadprog(p).x).toBeNull();
  });

  it('solves an equality-only problem (no inequalities) to the closed form x = -P^-1 q projected on the budget', () => {
    // min 1/2 (x1^2 + 2 x2^2) s.t. x1 + x2 = 1 -> x = (2/3, 1/3) (Lagrange conditions).
    const p: QpProblem = {
      P: fromRows([
        [1, 0],
        [0, 2],
      ]),
      q: new Float64Array(2),
      A: [{ idx: [0, 1], val: [1, 1] }],
      b: Float64Array.of(1),
      G: [],
      h: new Float64Array(0),
      lb: new Float64Array(2).fill(-Infinity),
      ub: new Float64Array(2).fill(Infinity),
    };
    const r = solveQp(p);
    expect(r.status).toBe('optimal');
    if (r.status === 'optimal') {
      expect(r.solution.x[0]).toBeCloseTo(2 / 3, 14);
      expect(r.solution.x[1]).toBeCloseTo(1 / 3, 14);
      expect(r.solution.y[0]).toBeCloseTo(-2 / 3, 14);
    }
  });

  it('reports shape errors as status error with the reason', () => {
    const p = randomQp(5, 1);
    const r = solveQp({ ...p, q: new Float64Array(4) });
    expect(r.status).toBe('error');
  });
});
