/**
 * The inner loops that the interior point, the factorisations, polishing and the KKT check
 * share. A command-line run solves once in a fresh process, so every loop starts in V8's
 * interpreter and runs some thousand times before it is optimised; a loop that every part of the
 * solver calls pays that once, where a copy in each part pays it again (measured on Node 20 with
 * the N = 500 bench: polishing's first factorisation took a third of the time once its dot
 * products were the ones the interior point's triangular solves had already made fast).
 */
import type { SparseRow } from './types.js';

/** s - sum_k a[ao + k] b[bo + k] over k < len, subtracted in increasing k. */
export function subtractDot(s: number, a: Float64Array, ao: number, b: Float64Array, bo: number, len: number): number {
  for (let k = 0; k < len; k++) s -= a[ao + k] * b[bo + k];
  return s;
}

/** max_k |v_k| (0 when empty; NaN when an entry is NaN). */
export function maxAbs(v: Float64Array): number {
  let m = 0;
  for (let k = 0; k < v.length; k++) m = Math.max(m, Math.abs(v[k]));
  return m;
}

/** v + sum_k a[ao + k] b[k] over k < len, added in increasing k. */
export function addDot(v: number, a: Float64Array, ao: number, b: Float64Array, len: number): number {
  for (let k = 0; k < len; k++) v += a[ao + k] * b[k];
  return v;
}

/** out[o + c] = a[ao + at_c]: a row of a matrix on the chosen columns. */
export function gatherInto(out: Float64Array, o: number, a: Float64Array, ao: number, at: Int32Array): void {
  for (let c = 0; c < at.length; c++) out[o + c] = a[ao + at[c]];
}

/** v + sum_k a[ao + at_k] u_k over k < count, added in increasing k. */
export function addGatheredDot(
  v: number,
  a: Float64Array,
  ao: number,
  at: Int32Array,
  u: Float64Array,
  count: number,
): number {
  for (let k = 0; k < count; k++) v += a[ao + at[k]] * u[k];
  return v;
}

/**
 * out_r = sum_t M[rows_r n + at_t] x_t for each r: rows of the n x n row-major M on the columns
 * `at` (increasing) times x, each sum from 0 in increasing t, as addGatheredDot(0, ...) makes it.
 * Terms with x_t = 0 are left out, and where x's non-zero entries are more than half of M's
 * columns each row is summed whole over x spread to full length (zeros elsewhere), reading M
 * contiguously: a zero term leaves a sum unchanged and a sum from +0 never turns to -0, so the
 * bits are addGatheredDot's either way (polishing's products with P on its free variables).
 */
export function gatheredRowsTimes(
  M: Float64Array,
  n: number,
  rows: Int32Array,
  at: Int32Array,
  x: Float64Array,
  out: Float64Array,
): void {
  let held = 0;
  for (let t = 0; t < at.length; t++) if (x[t] !== 0) held++;
  if (held * 2 > n) {
    const full = new Float64Array(n);
    for (let t = 0; t < at.length; t++) full[at[t]] = x[t];
    for (let r = 0; r < rows.length; r++) out[r] = addDot(0, M, rows[r] * n, full, n);
    return;
  }
  const cols = new Int32Array(held);
  const u = new Float64Array(held);
  for (let t = 0, h = 0; t < at.length; t++)
    if (x[t] !== 0) {
      cols[h] = at[t];
      u[h++] = x[t];
    }
  for (let r = 0; r < rows.length; r++) out[r] = addGatheredDot(0, M, rows[r] * n, cols, u, held);
}

/**
 * y = M x for M n x n row-major: gatheredRowsTimes on every row and column, so that where few of
 * x's entries are non-zero (a portfolio holds few of a large universe's assets) only those are
 * visited; the sums, and their order, of linalg's multiplyVector.
 */
export function timesVector(M: Float64Array, n: number, x: Float64Array): Float64Array {
  const all = Int32Array.from({ length: n }, (_, i) => i);
  const y = new Float64Array(n);
  gatheredRowsTimes(M, n, all, all, x, y);
  return y;
}

/**
 * Sparse rows (types.ts SparseRow) packed into three flat arrays (compressed sparse rows), once
 * per array of rows: one loop over them all instead of one call per row object.
 */
export interface PackedRows {
  /** Row r's entries are start[r] .. start[r + 1] - 1. */
  start: Int32Array;
  col: Int32Array;
  val: Float64Array;
}

const packed = new WeakMap<readonly SparseRow[], PackedRows>();

/** The rows packed, once per array of rows (a problem's rows are not changed once it is built). */
export function packedRows(rows: readonly SparseRow[]): PackedRows {
  let out = packed.get(rows);
  if (!out) packed.set(rows, (out = packRows(rows)));
  return out;
}

function packRows(rows: readonly SparseRow[]): PackedRows {
  const start = new Int32Array(rows.length + 1);
  for (let r = 0; r < rows.length; r++) start[r + 1] = start[r] + rows[r].idx.length;
  const col = new Int32Array(start[rows.length]);
  const val = new Float64Array(start[rows.length]);
  for (let r = 0; r < rows.length; r++) {
    const { idx, val: v } = rows[r];
    for (let t = 0, o = start[r]; t < idx.length; t++, o++) {
      col[o] = idx[t];
      val[o] = v[t];
    }
  }
  return { start, col, val };
}

/** row_r . x, summed from 0 over the row's entries in order (as kkt.ts rowDot). */
export function rowTimes(m: PackedRows, r: number, x: Float64Array): number {
  let s = 0;
  for (let t = m.start[r]; t < m.start[r + 1]; t++) s += m.val[t] * x[m.col[t]];
  return s;
}

/** out += f row_r (as kkt.ts addRow with a non-zero factor). */
export function addRowTimes(m: PackedRows, r: number, f: number, out: Float64Array): void {
  for (let t = m.start[r]; t < m.start[r + 1]; t++) out[m.col[t]] += f * m.val[t];
}

/** out_r = row_r . x for every row. */
export function rowsTimes(m: PackedRows, x: Float64Array, out: Float64Array): void {
  for (let r = 0; r + 1 < m.start.length; r++) out[r] = rowTimes(m, r, x);
}

/** out += sum_r f_r row_r, row by row, skipping f_r = 0 (as kkt.ts addRow). */
export function addRowsTimes(m: PackedRows, f: Float64Array, out: Float64Array): void {
  for (let r = 0; r + 1 < m.start.length; r++) if (f[r] !== 0) addRowTimes(m, r, f[r], out);
}
