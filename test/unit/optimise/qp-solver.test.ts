import { describe, expect, it } from 'vitest';
import { fromRows, type Matrix } from '../../../shared-core/linalg/matrix.js';
import { rowDot } from '../../../shared-core/optimise/qp/kkt.js';
import { ewmaCovariance } from '../../../shared-core/estimators/ewma.js';
import { phaseOne, QP_TOLERANCES, solveQp, type QpProblem } from '../../../shared-core/optimise/qp/index.js';
import { polish } from '../../../shared-core/optimise/qp/polish.js';
import { interiorPoint, startInteriorPoint } from '../../../shared-core/optimise/qp/interior-point.js';
import { directForm } from '../../../shared-core/optimise/formulate.js';
import { buildMandate } from '../../../shared-core/optimise/mandate.js';
import { screenPlan, screeningScore } from '../../../shared-core/optimise/screening.js';
import { CancelledError } from '../../../shared-core/stability/cancel.js';
import { seededRng } from '../../../shared-core/stability/rng.js';
import { solveWithQuadprog } from './quadprog-reference.js';
import { randomCovariance, randomQp } from './random-problems.js';

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

  it('agrees with npm quadprog 1.6.1 to 1e-7 on 6 random problems of 100-399 variables (centrality correctors)', () => {
    // From 120 variables the interior point tries Gondzio's correctors; seed 182 (234 variables)
    // stopped at the iteration limit without them.
    for (let seed = 179; seed <= 184; seed++) {
      const n = 100 + ((seed * 37) % 300);
      const p = randomQp(n, seed, { groups: seed % 4, linear: seed % 3 === 0 });
      const ours = solveQp(p);
      const ref = solveWithQuadprog(p);
      expect(ref.x, `seed ${seed}`).not.toBeNull();
      expect(ours.status, `seed ${seed}`).toBe('optimal');
      if (ours.status !== 'optimal' || ref.x === null) continue;
      for (let i = 0; i < n; i++)
        expect(Math.abs(ours.solution.x[i] - ref.x[i]), `seed ${seed} x${i}`).toBeLessThan(1e-7);
      expect(ours.kktResidual).toBeLessThan(1e-10);
      expect(maxViolation(p, ours.solution.x)).toBeLessThan(1e-9);
    }
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

  it('an interior point resumed to a tighter residual is the one run to it at once, iterate for iterate', () => {
    // What solve-qp.ts relies on when polishing fails at the handover: resuming costs only the
    // iterations still missing, and lands where an uninterrupted run lands.
    for (const seed of [3, 8, 21]) {
      const p = randomQp(40, seed, { groups: 2, linear: true });
      const once = interiorPoint(p, { tolerance: 1e-11 });
      const run = startInteriorPoint(p, {});
      const early = run.run(1e-6);
      const resumed = run.run(1e-11);
      expect(early.status).toBe('converged');
      expect(early.iterations).toBeLessThan(resumed.iterations);
      expect(resumed.status).toBe(once.status);
      expect(resumed.iterations).toBe(once.iterations);
      expect(Array.from(resumed.solution.x)).toEqual(Array.from(once.solution.x));
      // The first outcome is a copy: resuming did not move it.
      expect(early.residual).toBeGreaterThan(1e-11);
      expect(Array.from(early.solution.x)).not.toEqual(Array.from(resumed.solution.x));
    }
  });

  it('reports shape errors as status error with the reason', () => {
    const p = randomQp(5, 1);
    const r = solveQp({ ...p, q: new Float64Array(4) });
    expect(r.status).toBe('error');
  });

  it('a cancelled solve throws CancelledError, the one signal in the core that a computation was stopped', () => {
    const p = randomQp(40, 5, { groups: 2 });
    expect(() => solveQp(p, { shouldCancel: () => true })).toThrow(CancelledError);
    expect(() => phaseOne(p, () => true)).toThrow(CancelledError);
  });
});

/**
 * Long-only minimum variance, sum x = 1, 0 <= x <= cap. `spread` sets how far the assets' own
 * variances lie apart: a wide spread over strong factors leaves few assets in the optimum, close
 * variances over weak factors keep most of them (invented numbers).
 */
function longOnly(n: number, seed: number, shape: 'few' | 'most', cap: number): QpProblem {
  const rng = seededRng(seed);
  const P = randomCovariance(n, seed, 3, shape === 'few' ? 1 : 0, 1);
  for (let i = 0; i < n; i++) {
    if (shape === 'most') for (let j = 0; j < n; j++) P.data[i * n + j] *= 0.0005;
    P.data[i * n + i] += shape === 'few' ? 0.001 : 0.02 + 0.06 * rng.next();
  }
  return minimumVariance(P, cap);
}

/** min x'Px/2 with sum x = 1 and 0 <= x <= cap. */
function minimumVariance(P: Matrix, cap: number): QpProblem {
  const n = P.rows;
  return {
    P,
    q: new Float64Array(n),
    A: [{ idx: [...Array(n).keys()], val: Array<number>(n).fill(1) }],
    b: Float64Array.of(1),
    G: [],
    h: new Float64Array(0),
    lb: new Float64Array(n),
    ub: new Float64Array(n).fill(cap),
  };
}

describe('screening (solve on a working set, test the rest, polish on the full problem)', () => {
  // Strong factors leave few assets in the optimum; strong idiosyncratic risk keeps most of them.
  const shapes = [
    { name: 'few held', shape: 'few' as const },
    { name: 'most held', shape: 'most' as const },
  ];
  for (const shape of shapes)
    for (const cap of [0.02, 0.2])
      it(`${shape.name}, cap ${cap * 100}%: the same optimum as the full solve, to the same KKT residual`, () => {
        const n = 240;
        const p = longOnly(n, 11, shape.shape, cap);
        const all = [...Array(n).keys()];
        const full = solveQp(p);
        const screen = solveQp(p, { screen: { candidates: all, keep: all.slice(0, 60), order: all } });
        expect(full.status).toBe('optimal');
        expect(screen.status).toBe('optimal');
        if (full.status !== 'optimal' || screen.status !== 'optimal') return;
        for (let i = 0; i < n; i++) expect(Math.abs(screen.solution.x[i] - full.solution.x[i])).toBeLessThan(1e-9);
        expect(screen.kktResidual).toBeLessThan(QP_TOLERANCES.optimality);
        const held = full.solution.x.filter((v) => v > 1e-12).length;
        if (shape.shape === 'few') expect(held).toBeLessThan(n / 4);
        else expect(held).toBeGreaterThan(n / 2);
      });

  it('gives up for the full problem once its working set would pass a share of the variables', () => {
    const n = 240;
    const p = longOnly(n, 11, 'most', 0.02);
    const all = [...Array(n).keys()];
    const keep = all.slice(0, Math.ceil(QP_TOLERANCES.screenShare * n) + 1);
    const r = solveQp(p, { screen: { candidates: all, keep, order: all } });
    expect(r.path).toBe('interior-point+polish');
    expect(r.iterations).toBe(solveQp(p).iterations);
  });

  it('gives up polishing that crawls (an EWMA estimate, condition number near 1e9) and solves the full problem', () => {
    // Long-only minimum variance on the EWMA covariance (lambda 0.94) of 500 days of invented
    // one-factor returns for 120 assets, capped at 5/N; the first 40% of the assets free.
    const n = 120;
    const days = 500;
    const rng = seededRng(2);
    const normal = () => Math.sqrt(-2 * Math.log(1 - rng.next())) * Math.cos(2 * Math.PI * rng.next());
    const beta = Array.from({ length: n }, () => 0.15 + 0.1 * rng.next());
    const own = Array.from({ length: n }, () => 0.009 + 0.003 * rng.next());
    const returns = new Float64Array(days * n);
    for (let t = 0; t < days; t++) {
      const f = 0.008 * normal();
      for (let i = 0; i < n; i++) returns[t * n + i] = beta[i] * f + own[i] * normal();
    }
    const S = ewmaCovariance({ rows: days, cols: n, data: returns }, { method: 'ewma' }, { frequency: 'daily' });
    const p = minimumVariance({ rows: n, cols: n, data: S.covariance.data.map((v) => 252 * v) }, 5 / n);
    const all = [...Array(n).keys()];
    const keep = all.slice(0, 48);
    const guess = { activeRows: [], atLower: all.slice(48), atUpper: [] };
    // From this guess the active-set corrections change dozens of bounds a round, falling by a
    // fifth or less, and have not converged after 12 rounds.
    expect(polish(p, guess, 12).polished).toBeNull();
    const stalled = polish(p, guess, 12, QP_TOLERANCES.screenPolishStall);
    expect(stalled.polished).toBeNull();
    expect(stalled.solves).toBe(QP_TOLERANCES.screenPolishStall + 1);
    const full = solveQp(p);
    const screen = solveQp(p, { screen: { candidates: all, keep, order: all } });
    expect(screen.status).toBe('optimal');
    if (full.status !== 'optimal' || screen.status !== 'optimal') return;
    for (let i = 0; i < n; i++) expect(Math.abs(screen.solution.x[i] - full.solution.x[i])).toBeLessThan(1e-9);
    expect(screen.kktResidual).toBeLessThan(QP_TOLERANCES.optimality);
  });
});

describe('screening under group bands with a minimum (screening.ts screenPlan)', () => {
  it('starts from the best-scored members that can fill each band, not all of them, and reaches the full solve’s optimum', () => {
    const n = 200;
    const S = randomCovariance(n, 21, 3, 0, 1);
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) S.data[i * n + j] *= 0.0005;
      S.data[i * n + i] += 0.02 + (0.06 * ((i * 7919) % 101)) / 101;
    }
    const assets = Array.from({ length: n }, (_, i) => `A${i}`);
    for (const min of [0.15, 0.3]) {
      const groups = Array.from({ length: 5 }, (_, g) => ({
        name: `G${g + 1}`,
        members: assets.slice(g * 40, (g + 1) * 40),
        min: g === 0 ? min : 0.1,
        max: 0.4,
      }));
      const m = buildMandate(
        assets,
        { longOnly: true, weightBounds: { default: [0, 0.025] }, groups },
        undefined,
        undefined,
      );
      const form = directForm(m, S);
      const vols = Float64Array.from({ length: n }, (_, i) => Math.sqrt(S.data[i * n + i]));
      const plan = screenPlan(m, screeningScore(S, vols, false)!)!;
      expect(plan.keep.length).toBeLessThan(QP_TOLERANCES.screenShare * n);
      const full = solveQp(form.qp);
      const screened = solveQp(form.qp, { screen: plan });
      expect(screened.status).toBe('optimal');
      expect(screened.path).toBe('screened');
      if (full.status !== 'optimal' || screened.status !== 'optimal') return;
      for (let i = 0; i < n; i++) expect(Math.abs(screened.solution.x[i] - full.solution.x[i])).toBeLessThan(1e-9);
      expect(screened.kktResidual).toBeLessThan(QP_TOLERANCES.optimality);
    }
  });
});

describe('screening when the caps are so tight that the optimum holds most of the universe', () => {
  /** Minimum variance on a most-held universe, its optimum's held assets and its screening order. */
  function tightlyCapped(n: number, seed: number, capTimesN: number) {
    const p = longOnly(n, seed, 'most', capTimesN / n);
    const vols = Float64Array.from({ length: n }, (_, i) => Math.sqrt(p.P.data[i * n + i]));
    const score = screeningScore(p.P, vols, false)!;
    const order = [...Array(n).keys()].sort((a, b) => score[a] - score[b]);
    return { p, order, all: [...Array(n).keys()] };
  }

  for (const capTimesN of [1.5, 2, 3])
    it(`caps at ${capTimesN}/N: one round on the 1.2/cap best-scored assets reaches the full solve's optimum`, () => {
      const n = 240;
      const { p, order, all } = tightlyCapped(n, 5, capTimesN);
      const tight = order.slice(0, Math.ceil((QP_TOLERANCES.screenPerCapTight * n) / capTimesN));
      const full = solveQp(p);
      // The first working set (every asset) passes screenShare: the tighter one is tried.
      const screened = solveQp(p, { screen: { candidates: all, keep: all, order, tight } });
      expect(full.status).toBe('optimal');
      expect(screened.status).toBe('optimal');
      if (full.status !== 'optimal' || screened.status !== 'optimal') return;
      expect(screened.path).toBe('screened');
      const held = full.solution.x.filter((v) => v > 1e-12).length;
      expect(held).toBeGreaterThan(QP_TOLERANCES.screenShare * n);
      for (let i = 0; i < n; i++) expect(Math.abs(screened.solution.x[i] - full.solution.x[i])).toBeLessThan(1e-9);
      expect(screened.kktResidual).toBeLessThan(QP_TOLERANCES.optimality);
    });

  it('a tighter set that leaves out held assets still ends at the full optimum (polishing adds them, or the full solve)', () => {
    const n = 240;
    const { p, order, all } = tightlyCapped(n, 7, 1.5);
    const full = solveQp(p);
    expect(full.status).toBe('optimal');
    if (full.status !== 'optimal') return;
    const held = full.solution.x.filter((v) => v > 1e-12).length;
    // The worst-scored assets first: most of those the optimum holds are left out.
    const tight = [...order].reverse().slice(0, Math.ceil(n / 1.5) + 1);
    const screened = solveQp(p, { screen: { candidates: all, keep: all, order, tight } });
    expect(screened.status).toBe('optimal');
    if (screened.status !== 'optimal') return;
    expect(held).toBeGreaterThan(tight.length * 0.5);
    for (let i = 0; i < n; i++) expect(Math.abs(screened.solution.x[i] - full.solution.x[i])).toBeLessThan(1e-9);
    expect(screened.kktResidual).toBeLessThan(QP_TOLERANCES.optimality);
  });

  it('screenPlan offers the tighter set only from screenTightFrom assets, and only when it leaves some out', () => {
    const plan = (n: number, capTimesN: number) => {
      const assets = Array.from({ length: n }, (_, i) => `A${i}`);
      const m = buildMandate(
        assets,
        { longOnly: true, weightBounds: { default: [0, capTimesN / n] } },
        undefined,
        undefined,
      );
      return screenPlan(
        m,
        Float64Array.from({ length: n }, (_, i) => (i * 7919) % n),
      )!;
    };
    const n = QP_TOLERANCES.screenTightFrom;
    const tightPlan = plan(n, 2);
    expect(tightPlan.keep.length).toBeGreaterThan(QP_TOLERANCES.screenShare * n);
    expect(tightPlan.tight).toEqual(tightPlan.order.slice(0, Math.ceil((QP_TOLERANCES.screenPerCapTight * n) / 2)));
    expect(plan(n - 1, 2).tight).toBeUndefined(); // below screenTightFrom
    expect(plan(n, 1.2).tight).toBeUndefined(); // 1.2/cap is the whole universe
    expect(plan(n, 10).tight).toBeUndefined(); // 2/cap within screenShare: the usual working set
  });
});
