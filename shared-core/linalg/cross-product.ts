import { zeros, type Matrix } from './matrix.js';

/**
 * The cross product C = X'X of a T x N matrix (the symmetric rank-k update of BLAS, "syrk"):
 * the one O(N^2 T) step of every covariance estimator here. Written for speed in plain
 * TypeScript: X is packed into column panels stored period by period, so the inner loop reads
 * two contiguous streams, and each pass of the inner loop updates a 4 x 4 block of C held in
 * sixteen local accumulators (register blocking: eight loads feed sixteen multiply-adds).
 * Periods are taken 512 at a time so a pass's panels stay in cache. Of the 2 x 4, 3 x 4 and
 * 4 x 4 blocks measured on this machine, 4 x 4 was fastest. Only the lower triangle is
 * computed (N(N+1)/2 T multiply-adds) and then mirrored.
 */
export function crossProduct(x: Matrix): Matrix {
  const n = x.cols;
  const out = zeros(n, n);
  crossProductRows(x, out.data, 0, n);
  mirrorLower(out.data, n);
  return out;
}

/** Row and column panel widths of the kernel, and the periods per pass (the panels of one pass stay in cache). */
const ROWS = 4;
const COLS = 4;
const PERIODS_PER_PASS = 512;

/**
 * Rows [rowStart, rowEnd) of the lower triangle of X'X, written into `out` (N x N row-major,
 * entries (i, j) with j <= i). Pure and independent per row range, so an edge that owns
 * threads can hand disjoint ranges to workers sharing `out`.
 */
export function crossProductRows(x: Matrix, out: Float64Array, rowStart: number, rowEnd: number): void {
  const t = x.rows;
  const n = x.cols;
  if (rowEnd <= rowStart) return;
  for (let i = rowStart; i < rowEnd; i++) out.fill(0, i * n, i * n + i + 1);
  // The row panels are column panels too when the range starts on a panel boundary: pack once.
  const b = packPanels(x, 0, rowEnd, COLS);
  const shared = ROWS === COLS && rowStart % COLS === 0;
  const a = shared ? b.subarray((rowStart / COLS) * t * COLS) : packPanels(x, rowStart, rowEnd, ROWS);
  const rowPanels = Math.ceil((rowEnd - rowStart) / ROWS);
  for (let k0 = 0; k0 < t; k0 += PERIODS_PER_PASS) {
    const k1 = Math.min(t, k0 + PERIODS_PER_PASS);
    for (let I = 0; I < rowPanels; I++) {
      const i0 = rowStart + I * ROWS;
      const iLast = Math.min(i0 + ROWS, rowEnd) - 1;
      const pa = I * t * ROWS;
      const colPanels = Math.floor(iLast / COLS) + 1;
      for (let J = 0; J < colPanels; J++) block(a, pa, b, J * t * COLS, k0, k1, out, n, i0, J * COLS, iLast);
    }
  }
}

/** Length of the packed columns of a T x N matrix (packColumns). */
export function packedLength(x: Matrix): number {
  return Math.ceil(x.cols / COLS) * COLS * x.rows;
}

/** Every column of X packed as the kernel reads them, into `into` (which may be shared memory). */
export function packColumns(
  x: Matrix,
  into: Float64Array<ArrayBufferLike> = new Float64Array(packedLength(x)),
): Float64Array<ArrayBufferLike> {
  packPanels(x, 0, x.cols, COLS, into);
  return into;
}

/**
 * Row panels (4 rows each) of the lower triangle of X'X, from X packed by packColumns, for as
 * long as `claim` hands out a panel index (it returns -1 when none is left). Each entry is summed
 * in the same order as by crossProductRows, so the matrix is the same bit for bit however the
 * panels are shared out: an edge with two threads gives both the same claim, counting down from
 * the most expensive panel, and they finish together whatever their speeds. Returns the number
 * of panels computed.
 */
export function crossProductPanels(
  t: number,
  n: number,
  packed: Float64Array,
  out: Float64Array,
  claim: () => number,
): number {
  let done = 0;
  for (let I = claim(); I >= 0; I = claim()) {
    const i0 = I * ROWS;
    const iLast = Math.min(i0 + ROWS, n) - 1;
    for (let i = i0; i <= iLast; i++) out.fill(0, i * n, i * n + i + 1);
    const pa = I * t * ROWS;
    const colPanels = Math.floor(iLast / COLS) + 1;
    for (let k0 = 0; k0 < t; k0 += PERIODS_PER_PASS) {
      const k1 = Math.min(t, k0 + PERIODS_PER_PASS);
      for (let J = 0; J < colPanels; J++) block(packed, pa, packed, J * t * COLS, k0, k1, out, n, i0, J * COLS, iLast);
    }
    done++;
  }
  return done;
}

/** Number of row panels of an N x N cross product. */
export const rowPanels = (n: number): number => Math.ceil(n / ROWS);

/** Copies the lower triangle onto the upper one. */
export function mirrorLower(c: Float64Array, n: number): void {
  for (let i = 0; i < n; i++) for (let j = 0; j < i; j++) c[j * n + i] = c[i * n + j];
}

/** The textbook triple loop over the lower triangle, kept as the baseline the benchmark compares with. */
export function crossProductNaive(x: Matrix): Matrix {
  const t = x.rows;
  const n = x.cols;
  const out = zeros(n, n);
  const c = out.data;
  const d = x.data;
  for (let k = 0; k < t; k++) {
    const o = k * n;
    for (let i = 0; i < n; i++) {
      const xi = d[o + i];
      const ci = i * n;
      for (let j = 0; j <= i; j++) c[ci + j] += xi * d[o + j];
    }
  }
  mirrorLower(c, n);
  return out;
}

/**
 * One 4 x 4 block of C over periods [k0, k1), added into `out`. A function of its own, called
 * thousands of times, so V8 optimises it after a few calls with complete type feedback; inside
 * one long function the loop was compiled on the fly and then deoptimised at the first pass's end,
 * which made a first call in a fresh process (every command-line run) up to 1.5x slower.
 */
function block(
  a: Float64Array,
  pa: number,
  b: Float64Array,
  pb: number,
  k0: number,
  k1: number,
  out: Float64Array,
  n: number,
  i0: number,
  j0: number,
  iLast: number,
): void {
  let c00 = 0,
    c01 = 0,
    c02 = 0,
    c03 = 0,
    c10 = 0,
    c11 = 0,
    c12 = 0,
    c13 = 0,
    c20 = 0,
    c21 = 0,
    c22 = 0,
    c23 = 0,
    c30 = 0,
    c31 = 0,
    c32 = 0,
    c33 = 0;
  for (let k = k0; k < k1; k++) {
    const p = pa + k * ROWS;
    const q = pb + k * COLS;
    const a0 = a[p];
    const a1 = a[p + 1];
    const a2 = a[p + 2];
    const a3 = a[p + 3];
    const b0 = b[q];
    const b1 = b[q + 1];
    const b2 = b[q + 2];
    const b3 = b[q + 3];
    c00 += a0 * b0;
    c01 += a0 * b1;
    c02 += a0 * b2;
    c03 += a0 * b3;
    c10 += a1 * b0;
    c11 += a1 * b1;
    c12 += a1 * b2;
    c13 += a1 * b3;
    c20 += a2 * b0;
    c21 += a2 * b1;
    c22 += a2 * b2;
    c23 += a2 * b3;
    c30 += a3 * b0;
    c31 += a3 * b1;
    c32 += a3 * b2;
    c33 += a3 * b3;
  }
  add(out, n, i0, j0, iLast, c00, c01, c02, c03);
  add(out, n, i0 + 1, j0, iLast, c10, c11, c12, c13);
  add(out, n, i0 + 2, j0, iLast, c20, c21, c22, c23);
  add(out, n, i0 + 3, j0, iLast, c30, c31, c32, c33);
}

function add(
  out: Float64Array,
  n: number,
  i: number,
  j0: number,
  iLast: number,
  v0: number,
  v1: number,
  v2: number,
  v3: number,
): void {
  if (i > iLast) return;
  const o = i * n + j0;
  // Only entries on or below the diagonal, and inside the matrix.
  if (j0 <= i) out[o] += v0;
  if (j0 + 1 <= i) out[o + 1] += v1;
  if (j0 + 2 <= i) out[o + 2] += v2;
  if (j0 + 3 <= i) out[o + 3] += v3;
}

/** Columns [c0, c1) of X as panels of `width` columns, each stored period by period; zero padded. */
function packPanels(
  x: Matrix,
  c0: number,
  c1: number,
  width: number,
  p: Float64Array<ArrayBufferLike> = new Float64Array(Math.ceil((c1 - c0) / width) * width * x.rows),
): Float64Array<ArrayBufferLike> {
  const t = x.rows;
  const n = x.cols;
  const d = x.data;
  // Row by row, so X is read in memory order.
  for (let k = 0; k < t; k++) {
    const row = k * n;
    for (let col = c0; col < c1; col++) {
      const P = ((col - c0) / width) | 0;
      p[P * width * t + k * width + ((col - c0) % width)] = d[row + col];
    }
  }
  return p;
}
