import { describe, expect, it } from 'vitest';
import { solveEqualityKkt, type EqualityKkt } from '../../../shared-core/optimise/qp/equality-kkt.js';
import { directForm, homogenisedForm } from '../../../shared-core/optimise/formulate.js';
import { packedRows } from '../../../shared-core/optimise/qp/kernels.js';
import { buildMandate } from '../../../shared-core/optimise/mandate.js';
import type { QpProblem, SparseRow } from '../../../shared-core/optimise/qp/index.js';
import {
  equalityKktRefinement,
  solveEqualityKktSubstituted,
  substitutionOf,
} from '../../../shared-core/optimise/qp/substitute-two-entry-rows.js';
import { seededRng, type Rng } from '../../../shared-core/stability/rng.js';
import { ids } from './helpers.js';
import { gaussian, randomCovariance } from './random-problems.js';

/**
 * Polishing's KKT system on a guessed active set, as polishing writes it (qp/polish.ts): the
 * free variables (the held assets and the scale kappa), the equality rows and the active rows on
 * their positions; the assets left out sit at their zero bound and add nothing to either side.
 */
function activeSystem(p: QpProblem, free: number[], rows: SparseRow[]): EqualityKkt {
  const pos = new Map(free.map((v, a) => [v, a]));
  const onFree = rows.map((row) => {
    const idx: number[] = [];
    const val: number[] = [];
    row.idx.forEach((v, t) => {
      if (pos.has(v)) {
        idx.push(pos.get(v)!);
        val.push(row.val[t]);
      }
    });
    return { idx, val };
  });
  return { P: p.P.data, n: p.q.length, free: Int32Array.from(free), C: packedRows(onFree) };
}

/** The largest difference between the two solutions, relative to the largest entry. */
function relativeGap(a: Float64Array, b: Float64Array): number {
  let gap = 0;
  let scale = 0;
  for (let k = 0; k < a.length; k++) {
    gap = Math.max(gap, Math.abs(a[k] - b[k]));
    scale = Math.max(scale, Math.abs(a[k]));
  }
  return gap / scale;
}

/**
 * Maximum diversification in the homogenised form (formulate.ts), long-only under a cap: the cap
 * of asset i is the row y_i - cap kappa <= 0. A random active set: most assets held, many of
 * them at their cap.
 */
function cappedMaxDiversification(seed: number, rng: Rng) {
  const n = 20 + rng.int(60);
  const S = randomCovariance(n, seed, 3, 1, 0.5);
  const vols = Float64Array.from({ length: n }, (_, i) => Math.sqrt(S.data[i * n + i]));
  const cap = (1.2 + 2 * rng.next()) / n;
  const m = buildMandate(ids(n), { longOnly: true, weightBounds: { default: [0, cap] } }, undefined, undefined);
  const f = homogenisedForm(m, S, vols);
  const held = [...Array(n).keys()].filter(() => rng.next() < 0.85);
  const atCap = held.filter(() => rng.next() < 0.6);
  const capRow = (i: number) => f.qp.G.findIndex((r) => r.idx.length === 2 && r.idx[0] === i && r.val[0] === 1);
  return { n, cap, f, held, atCap, capRow };
}

/**
 * Minimum variance under a turnover limit against random current weights c (mandate.ts: t_i >=
 * x_i - c_i and t_i >= c_i - x_i, sum t <= limit), with a random active set in which many assets
 * sit at their current weight. Each asset is one of:
 * - moving: x_i and t_i free, one link row active (its direction random, both directions present);
 * - kept, t_i at its bound: x_i free, one link row active, which on the free variables is x_i alone;
 * - kept, t_i free: both link rows active, two rows on x_i and t_i;
 * - kept, both rows, t_i at its bound: x_i <= c_i and -x_i <= -c_i, dependent (only with `dependent`);
 * - at zero: x_i at its bound, t_i free on the row -x_i - t_i <= -c_i, t_i alone.
 * The budget and the limit's sum row are active as well. Right-hand sides are random, the
 * dependent rows' consistent.
 */
function turnoverActiveSet(seed: number, rng: Rng, dependent = false) {
  const n = 15 + rng.int(40);
  const S = randomCovariance(n, seed + 900, 3, 1, 0.4);
  const current = Object.fromEntries(ids(n).map((a) => [a, (0.5 + rng.next()) / n]));
  const m = buildMandate(ids(n), { longOnly: true, maxTurnover: 0.3 }, current, undefined);
  const f = directForm(m, S);
  const link = (i: number, up: boolean) =>
    f.qp.G.findIndex((r) => r.idx.length === 2 && r.idx[0] === i && r.idx[1] === n + i && r.val[0] === (up ? 1 : -1));
  const sumRow = f.qp.G.findIndex((r) => r.idx.length === n);
  const kinds = ['moving', 'kept at bound', 'kept free', 'at zero', 'kept, both at bound'] as const;
  const kind = Array.from({ length: n }, (_, i) => (i < 2 ? 'moving' : kinds[rng.int(dependent ? 5 : 4)]));
  const free: number[] = [];
  const rows: SparseRow[] = [...f.qp.A, f.qp.G[sumRow]];
  const s: number[] = [gaussian(rng), gaussian(rng)];
  const add = (row: number) => {
    rows.push(f.qp.G[row]);
    s.push(gaussian(rng));
  };
  kind.forEach((k, i) => {
    if (k !== 'at zero') free.push(i);
    if (k !== 'kept at bound' && k !== 'kept, both at bound') free.push(n + i);
    if (k === 'moving') add(link(i, i === 0 ? true : i === 1 ? false : rng.next() < 0.5));
    if (k === 'kept at bound') add(link(i, rng.next() < 0.5));
    if (k === 'kept free') [true, false].forEach((up) => add(link(i, up)));
    if (k === 'at zero') add(link(i, false));
    if (k === 'kept, both at bound') {
      [true, false].forEach((up) => add(link(i, up)));
      s[s.length - 1] = -s[s.length - 2];
    }
  });
  const count = (k: string) => kind.filter((v) => v === k).length;
  const fixed = count('kept at bound') + 2 * count('kept free') + count('at zero') + count('kept, both at bound');
  return { f, free, rows, s: Float64Array.from(s), fixed, dependentPairs: count('kept, both at bound') };
}

/**
 * Polishing's system on the binding caps of cappedMaxDiversification: the free variables (the
 * held assets and kappa), the equality rows and every binding cap row, with a random right-hand
 * side r on the variables and the rows' own s.
 */
function capsBindingSystem(seed: number, rng: Rng) {
  const { n, f, held, atCap, capRow } = cappedMaxDiversification(seed, rng);
  const rows = [...f.qp.A, ...atCap.map((i) => f.qp.G[capRow(i)])];
  const e = activeSystem(f.qp, [...held, n], rows);
  const r = Float64Array.from({ length: held.length + 1 }, () => 0.01 * gaussian(rng));
  const s = Float64Array.from(rows, (_, j) => (j < f.qp.A.length ? f.qp.b[j] : 0));
  return { e, r, s, atCap };
}

describe('polishing substitutes variables out on active rows of one and two entries (qp/substitute-two-entry-rows.ts)', () => {
  it('binding caps of maximum diversification: the same solution and multipliers as the whole KKT system to 1e-12', () => {
    // Property: with each binding cap y_i = cap kappa substituted out (y_i's curvature folded into
    // kappa's row and column, the cap's multiplier from y_i's stationarity), the reduced system's
    // answer, carried back, solves the whole system: every weight and every multiplier equals the
    // whole system's to 1e-12 of the largest entry, on 40 random problems (N = 20-80, 30-70 %
    // of the assets at their cap), with every cap row substituted.
    const rng = seededRng(2026);
    for (let seed = 1; seed <= 40; seed++) {
      const { e, r, s, atCap } = capsBindingSystem(seed, rng);
      const plan = substitutionOf(e);
      expect(plan.all?.hubMembers, `seed ${seed}`).toBe(atCap.length);
      const whole = solveEqualityKkt(e, r, s)!;
      const substituted = solveEqualityKktSubstituted(e, r, s)!;
      expect(relativeGap(whole, substituted), `seed ${seed}`).toBeLessThan(1e-12);
    }
  });

  it('a refinement stopped at a residual and resumed makes the corrections of one run to the end, bit for bit', () => {
    // Polishing judges a guess from the solution at a modest residual and refines only the one it
    // keeps: resuming must give exactly the answer of refining at once.
    const rng = seededRng(2027);
    for (let seed = 1; seed <= 12; seed++) {
      const { e, r, s } = capsBindingSystem(seed, rng);
      const atOnce = solveEqualityKktSubstituted(e, r, s)!;
      const staged = equalityKktRefinement(e, r, s)!;
      const early = Float64Array.from(staged.until(1e-6));
      expect(relativeGap(early, atOnce), `seed ${seed}`).toBeLessThan(1e-6);
      const resumed = staged.until(0);
      expect(staged.ended).toBe(true);
      expect(
        Array.from(resumed).every((v, i) => Object.is(v, atOnce[i])),
        `seed ${seed}`,
      ).toBe(true);
    }
  });

  it('any rows a y_i + b v = s sharing v, with curvature on v and auxiliaries on other rows: the same answer to 1e-12', () => {
    // Property: the algebra is that of any two-entry rows sharing one variable (random
    // coefficients and right-hand sides, v with curvature of its own), composed with the
    // auxiliaries' substitution (flat variables t_j = (s - b x_j) / a on assets not tied to v).
    const rng = seededRng(77);
    for (let seed = 1; seed <= 30; seed++) {
      const n = 15 + rng.int(30);
      const S = randomCovariance(n + 1, seed + 500, 2, 1, 0.3);
      const aux = 3 + rng.int(5);
      const dim = n + 1 + aux;
      const P = new Float64Array(dim * dim);
      for (let i = 0; i <= n; i++) P.set(S.data.subarray(i * (n + 1), (i + 1) * (n + 1)), i * dim);
      const p: QpProblem = {
        P: { rows: dim, cols: dim, data: P },
        q: new Float64Array(dim),
        A: [],
        b: new Float64Array(0),
        G: [],
        h: new Float64Array(0),
        lb: new Float64Array(dim),
        ub: new Float64Array(dim),
      };
      const hub = n;
      const tied = [...Array(n).keys()].filter(() => rng.next() < 0.5);
      const loose = [...Array(n).keys()].filter((i) => !tied.includes(i));
      const rows: SparseRow[] = [
        { idx: [...Array(n + 1).keys()], val: Array.from({ length: n + 1 }, () => 0.5 + rng.next()) },
        { idx: [...Array(n).keys()], val: Array.from({ length: n }, () => gaussian(rng)) },
        ...tied.map((i) => ({ idx: [i, hub], val: [0.5 + rng.next(), -0.1 - rng.next()] })),
        ...Array.from({ length: Math.min(aux, loose.length) }, (_, j) => ({
          idx: [n + 1 + j, loose[j]],
          val: [rng.next() < 0.5 ? -1 : 1, 1],
        })),
        { idx: Array.from({ length: aux }, (_, j) => n + 1 + j), val: Array<number>(aux).fill(1) },
      ];
      const e = activeSystem(p, [...Array(dim).keys()], rows);
      const r = Float64Array.from({ length: dim }, () => gaussian(rng));
      const s = Float64Array.from(rows, () => gaussian(rng));
      const plan = substitutionOf(e);
      expect(plan.all?.hubMembers, `seed ${seed}`).toBe(tied.length);
      expect(plan.all?.auxiliaries, `seed ${seed}`).toBe(Math.min(aux, loose.length));
      const whole = solveEqualityKkt(e, r, s)!;
      const substituted = solveEqualityKktSubstituted(e, r, s)!;
      expect(relativeGap(whole, substituted), `seed ${seed}`).toBeLessThan(1e-12);
    }
  });

  it('a degenerate active set (a band whose members all sit at their caps) is solved whole, as before', () => {
    // The band's row is the sum of its members' cap rows: the multipliers are not determined, and
    // the choice among them stays the whole system's (the explanations' prices depend on it).
    const rng = seededRng(5);
    const { n, cap, f, held, atCap, capRow } = cappedMaxDiversification(3, rng);
    const band = atCap.slice(0, 4);
    const bandRow: SparseRow = { idx: [...band, n], val: [...band.map(() => 1), -band.length * cap] };
    const rows = [...f.qp.A, ...atCap.map((i) => f.qp.G[capRow(i)]), bandRow];
    const e = activeSystem(f.qp, [...held, n], rows);
    const r = new Float64Array(held.length + 1);
    const s = Float64Array.from(rows, (_, j) => (j < f.qp.A.length ? f.qp.b[j] : 0));
    expect(substitutionOf(e).all?.hubMembers).toBe(atCap.length);
    expect(Array.from(solveEqualityKktSubstituted(e, r, s)!)).toEqual(Array.from(solveEqualityKkt(e, r, s)!));
  });
  it('assets kept at their current weight under a turnover limit: fixed, with the same solution and multipliers to 1e-12', () => {
    // Property: variables that the active rows determine outright (a row with one free entry, or
    // two rows on the same x_i and t_i) leave the system, and their rows' multipliers come back
    // from those variables' own stationarity equations (a 1 x 1 or 2 x 2 solve each). On 40
    // random active sets (N = 15-55, about half the assets at their current weight, some at zero
    // with t_i free) and random right-hand sides, every weight, auxiliary and multiplier equals
    // the whole KKT system's answer to 1e-12 of the largest entry, with every such variable fixed.
    const rng = seededRng(3030);
    for (let seed = 1; seed <= 40; seed++) {
      const { f, free, rows, s, fixed } = turnoverActiveSet(seed, rng);
      const e = activeSystem(f.qp, free, rows);
      const r = Float64Array.from(free, () => gaussian(rng));
      expect(substitutionOf(e).all?.fixed, `seed ${seed}`).toBe(fixed);
      const whole = solveEqualityKkt(e, r, s)!;
      const substituted = solveEqualityKktSubstituted(e, r, s)!;
      expect(relativeGap(whole, substituted), `seed ${seed}`).toBeLessThan(1e-12);
    }
  });

  it('both link rows active and t_i at its bound (dependent rows): fixed, their multipliers split by least squares', () => {
    // x_i <= c_i and -x_i <= -c_i on x_i alone are dependent: their multipliers are determined
    // only as l+ - l-, and any l+ + l- solves the system. The whole system's ridge picks the
    // least-squares split (no component in the null space of C') up to rounding that the ridge
    // amplifies (relative 1e-6 to 1e-4 here); the substitution takes that split exactly from
    // x_i's stationarity. Property, on 40 random active sets with such assets among the others:
    // the weights, the other rows' multipliers and each l+ - l- equal the whole system's to 1e-12
    // of the largest entry, each l+ + l- is zero, and the whole system's is within its rounding.
    const rng = seededRng(41);
    for (let seed = 1; seed <= 40; seed++) {
      const { f, free, rows, s, fixed, dependentPairs } = turnoverActiveSet(seed, rng, true);
      const e = activeSystem(f.qp, free, rows);
      const r = Float64Array.from(free, () => gaussian(rng));
      expect(dependentPairs, `seed ${seed}`).toBeGreaterThan(0);
      expect(substitutionOf(e).all?.fixed, `seed ${seed}`).toBe(fixed);
      const whole = solveEqualityKkt(e, r, s)!;
      const substituted = solveEqualityKktSubstituted(e, r, s)!;
      const k = free.length;
      const scale = Math.max(...whole.map(Math.abs));
      const dependentRow = (j: number) =>
        rows[j].idx.length === 2 &&
        !free.includes(rows[j].idx[1]) &&
        j + 1 < rows.length &&
        rows[j + 1].idx[0] === rows[j].idx[0];
      const sameAs = (a: number, b: number, what: string) =>
        expect(Math.abs(a - b) / scale, `seed ${seed} ${what}`).toBeLessThan(1e-12);
      for (let a = 0; a < k; a++) sameAs(substituted[a], whole[a], `x ${a}`);
      for (let j = 0; j < rows.length; j++) {
        const [l, w] = [substituted[k + j], whole[k + j]];
        if (!dependentRow(j)) {
          if (j === 0 || !dependentRow(j - 1)) sameAs(l, w, `row ${j}`);
          continue;
        }
        const [l2, w2] = [substituted[k + j + 1], whole[k + j + 1]];
        sameAs(l - l2, w - w2, `rows ${j}, ${j + 1}: l+ - l-`);
        expect(Math.abs(l + l2) / scale, `seed ${seed}`).toBeLessThan(1e-14);
        expect(Math.abs(w + w2) / scale, `seed ${seed}`).toBeLessThan(1e-3);
      }
    }
  });
});
