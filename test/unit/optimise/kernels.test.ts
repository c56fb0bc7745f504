/**
 * The solver's loops were reorganised for the first solve in a fresh process (qp/kernels.ts,
 * qp/dense-factor.ts); they promise the sums of the textbook loops in the same order, so the
 * answers do not move by a bit. These checks hold them to the textbook forms written out here:
 * LU with partial pivoting by row elimination (Golub and Van Loan, Matrix Computations, the
 * outer-product "kij" form; recalled from memory), y = M x by rows (linalg multiplyVector), and
 * the sparse-row products of kkt.ts.
 */
import { describe, expect, it } from 'vitest';
import { multiplyVector } from '../../../shared-core/linalg/matrix.js';
import { luFactor, luSolve } from '../../../shared-core/optimise/qp/dense-factor.js';
import {
  addGatheredDot,
  addRowsTimes,
  gatheredRowsTimes,
  packedRows,
  rowsTimes,
  timesVector,
} from '../../../shared-core/optimise/qp/kernels.js';
import { addRow, rowDot } from '../../../shared-core/optimise/qp/kkt.js';
import type { SparseRow } from '../../../shared-core/optimise/qp/types.js';
import { seededRng } from '../../../shared-core/stability/rng.js';

/** Row elimination with partial pivoting, one row update after another (the form the solver had). */
function eliminationLu(a: Float64Array, n: number): { lu: Float64Array; perm: Int32Array } | null {
  const lu = Float64Array.from(a);
  const perm = Int32Array.from({ length: n }, (_, i) => i);
  let scale = 0;
  for (const v of lu) scale = Math.max(scale, Math.abs(v));
  const tiny = scale * 1e-300 + 1e-300;
  for (let k = 0; k < n; k++) {
    let p = k;
    let best = Math.abs(lu[k * n + k]);
    for (let i = k + 1; i < n; i++)
      if (Math.abs(lu[i * n + k]) > best) {
        best = Math.abs(lu[i * n + k]);
        p = i;
      }
    if (!(best > tiny)) return null;
    for (let j = 0; j < n; j++) [lu[k * n + j], lu[p * n + j]] = [lu[p * n + j], lu[k * n + j]];
    [perm[k], perm[p]] = [perm[p], perm[k]];
    const inv = 1 / lu[k * n + k];
    for (let i = k + 1; i < n; i++) {
      const f = lu[i * n + k] * inv;
      if (f === 0) continue;
      lu[i * n + k] = f;
      for (let j = k + 1; j < n; j++) lu[i * n + j] -= f * lu[k * n + j];
    }
  }
  return { lu, perm };
}

/** A polishing-like KKT matrix [[P + d I, C'], [C, -d I]]: P a covariance, C sparse rows. */
function kktLike(k: number, m: number, seed: number): Float64Array {
  const rng = seededRng(seed);
  const dim = k + m;
  const K = new Float64Array(dim * dim);
  const B = Array.from({ length: k }, () => [rng.next() - 0.5, rng.next() - 0.5, rng.next() - 0.5]);
  for (let i = 0; i < k; i++)
    for (let j = 0; j < k; j++)
      K[i * dim + j] =
        0.1 * (B[i][0] * B[j][0] + B[i][1] * B[j][1] + B[i][2] * B[j][2]) + (i === j ? 0.02 * rng.next() : 0);
  for (let r = 0; r < m; r++) {
    const cols = r === 0 ? [...Array(k).keys()] : [Math.floor(rng.next() * k), k - 1];
    for (const c of cols) {
      const v = r === 0 ? 1 : c === k - 1 ? -0.02 : 1;
      K[(k + r) * dim + c] += v;
      K[c * dim + k + r] += v;
    }
  }
  for (let a = 0; a < dim; a++) K[a * dim + a] += a < k ? 1e-12 : -1e-12;
  return K;
}

const sameBits = (a: ArrayLike<number>, b: ArrayLike<number>): boolean =>
  a.length === b.length && Array.from(a).every((v, i) => Object.is(v, b[i]));

describe('the solver kernels keep the textbook sums', () => {
  it('LU in Crout order is the row-elimination factor bit for bit, pivots included', () => {
    for (let seed = 1; seed <= 40; seed++) {
      const rng = seededRng(seed);
      const dense = seed % 2 === 0;
      const n = dense ? 3 + (seed % 29) : 0;
      const a = dense
        ? Float64Array.from({ length: n * n }, () => rng.next() - 0.5)
        : kktLike(8 + seed, 1 + (seed % 9), seed);
      const dim = dense ? n : Math.round(Math.sqrt(a.length));
      const ours = luFactor(a, dim);
      const ref = eliminationLu(a, dim);
      expect(ours === null, `seed ${seed}`).toBe(ref === null);
      if (!ours || !ref) continue;
      expect(sameBits(ours.perm, ref.perm), `seed ${seed} pivots`).toBe(true);
      expect(sameBits(ours.lu, ref.lu), `seed ${seed} factor`).toBe(true);
      // And it solves: A x = b to rounding, relative to the size of x.
      const b = Float64Array.from({ length: dim }, () => rng.next());
      const x = luSolve(ours, b);
      const size = 1 + Math.max(...Array.from(x, Math.abs));
      for (let i = 0; i < dim; i++) {
        let r = -b[i];
        for (let j = 0; j < dim; j++) r += a[i * dim + j] * x[j];
        expect(Math.abs(r) / size, `seed ${seed} row ${i}`).toBeLessThan(1e-10);
      }
    }
  });

  it('a singular matrix is refused, as by elimination', () => {
    const a = Float64Array.of(1, 2, 3, 2, 4, 6, 1, 0, 1);
    expect(eliminationLu(a, 3)).toBeNull();
    expect(luFactor(a, 3)).toBeNull();
  });

  it('M x visiting only the non-zero entries of x equals linalg multiplyVector bit for bit', () => {
    const rng = seededRng(7);
    const n = 61;
    const M = Float64Array.from({ length: n * n }, () => rng.next() - 0.5);
    for (const share of [1, 0.6, 0.3, 0.05, 0]) {
      const x = Float64Array.from({ length: n }, () => (rng.next() < share ? rng.next() - 0.5 : 0));
      expect(sameBits(timesVector(M, n, x), multiplyVector({ rows: n, cols: n, data: M }, x)), `share ${share}`).toBe(
        true,
      );
    }
  });

  it("rows of M on polishing's free columns times x equal addGatheredDot over every free column bit for bit", () => {
    // Whether x is dense (whole rows read over x spread to full length) or sparse (its zeros left
    // out), each sum is the gathered one's from 0 over the free columns in order.
    const rng = seededRng(19);
    const n = 73;
    const M = Float64Array.from({ length: n * n }, () => rng.next() - 0.5);
    for (const freeShare of [1, 0.8, 0.5, 0.2])
      for (const share of [1, 0.7, 0.4, 0.05, 0]) {
        const at = Int32Array.from([...Array(n).keys()].filter(() => rng.next() < freeShare));
        const x = Float64Array.from(at, () => (rng.next() < share ? rng.next() - 0.5 : 0));
        const rows = Int32Array.from([...Array(n).keys()].filter(() => rng.next() < 0.5));
        const ours = new Float64Array(rows.length);
        gatheredRowsTimes(M, n, rows, at, x, ours);
        const ref = Float64Array.from(rows, (i) => addGatheredDot(0, M, i * n, at, x, at.length));
        expect(sameBits(ours, ref), `free ${freeShare}, non-zero ${share}`).toBe(true);
      }
  });

  it('packed rows give the sums of kkt.ts rowDot and addRow', () => {
    const rng = seededRng(11);
    const n = 40;
    const rows: SparseRow[] = Array.from({ length: 25 }, (_, r) => {
      const idx = [...Array(n).keys()].filter(() => rng.next() < (r % 5 === 0 ? 0.9 : 0.08));
      return { idx, val: idx.map(() => rng.next() - 0.5) };
    });
    const x = Float64Array.from({ length: n }, () => rng.next() - 0.5);
    const f = Float64Array.from(rows, (_, r) => (r % 4 === 0 ? 0 : rng.next() - 0.5));
    const packed = packedRows(rows);
    expect(packedRows(rows)).toBe(packed);
    const dots = new Float64Array(rows.length);
    rowsTimes(packed, x, dots);
    expect(
      sameBits(
        dots,
        rows.map((r) => rowDot(r, x)),
      ),
    ).toBe(true);
    const ours = Float64Array.from(x);
    addRowsTimes(packed, f, ours);
    const ref = Float64Array.from(x);
    rows.forEach((r, j) => addRow(ref, r, f[j]));
    expect(sameBits(ours, ref)).toBe(true);
  });
});
