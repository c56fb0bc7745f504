import { inTwoShares, kernelTeam, sharedArray } from './kernel-team.js';
import type { Matrix } from './matrix.js';
import { helperKernels, wasmKernels, type WasmKernels } from './wasm/wasm-kernels.js';

/**
 * A symmetric matrix reduced to tridiagonal form, A = Q T Q', with Q kept as its Householder
 * reflectors. One reduction (about 4/3 N^3 flops) serves every later question about A's spectrum
 * at O(N^2) each: all the eigenvalues (the exact condition number), and the exposures of any
 * vector to the eigenvectors (the effective number of bets of every candidate that shares the
 * estimate), without ever forming the eigenvectors.
 */
export interface TridiagonalForm {
  n: number;
  /** Diagonal of T. */
  diagonal: Float64Array;
  /** offDiagonal[i] couples rows i-1 and i of T (offDiagonal[0] = 0). */
  offDiagonal: Float64Array;
  /**
   * Step i's Householder vector u (entries 0..i-1) in reflectors[i*n .. i*n+i), with its
   * u'u / 2 in halfNorms[i] (0 where step i had nothing to reduce): H_i = I - u u' / halfNorms[i].
   */
  reflectors: Float64Array;
  halfNorms: Float64Array;
}

/** Where a step's pass over an m x m block splits into two halves of equal work (columns shorten). */
function passSplit(m: number): number {
  return Math.floor(m * (1 - Math.SQRT1_2));
}

/** Whether the reduction of an n x n matrix splits its passes over the kernel team (for the kernels that run). */
export function tridiagonalFormForks(n: number): boolean {
  const wasm = wasmKernels();
  return wasm ? wasm.shared && n > MIN_SHARED_WASM_PASS + 1 : n > MIN_SHARED_PASS + 1;
}

/**
 * Householder tridiagonalisation (the reduction of tred2, EISPACK, Smith et al. 1976) organised as
 * one pass over the trailing block per step: the rank-two update of step i and the matrix-vector
 * product that step i - 1 needs share each load of an entry, because the next reflector comes
 * from row i - 1, which is updated first. Each pass sums its two column ranges [0, passSplit(m))
 * and [passSplit(m), m) into accumulators of their own, added in a fixed order: that order is the
 * one every published figure (the command line's outputs, the fixtures) was computed in, so a
 * change to it would move their last digits. Only the upper triangle of `m` is read.
 *
 * Where the WebAssembly kernels run (wasm/wasm-kernels.ts) the whole reduction runs in the module
 * (tridiagonal.c), its passes in SIMD, the same sums in the same order. Without them, with a
 * kernel team (kernel-team.ts) the second range is the helper thread's share of each pass.
 */
export function tridiagonalForm(m: Matrix): TridiagonalForm {
  const n = m.rows;
  if (m.cols !== n) throw new RangeError(`expected a square matrix, got ${m.rows} x ${m.cols}`);
  const wasm = wasmKernels();
  if (wasm) return tridiagonalFormInWasm(m, wasm);
  // A[k][j] (k >= j) lives in w[j * n + k]: column j of the lower triangle is contiguous. It is
  // row j of the upper triangle of the symmetric input, so each column is one contiguous copy.
  const team = n > MIN_SHARED_PASS ? kernelTeam() : null;
  const w = sharedArray(team, n * n);
  for (let j = 0; j < n; j++) w.set(m.data.subarray(j * n + j, j * n + n), j * n + j);
  const u = sharedArray(team, n);
  const q = sharedArray(team, n);
  const v = sharedArray(team, n);
  const p2 = sharedArray(team, n); // A v over the second column range of a pass
  const d = new Float64Array(n);
  const e = new Float64Array(n);
  const halfNorms = new Float64Array(n);
  const p = new Float64Array(n); // A u for the current step, summed during the previous pass
  if (n <= 1) {
    if (n === 1) d[0] = w[0];
    return { n, diagonal: d, offDiagonal: e, reflectors: w, halfNorms };
  }
  let ready = false;
  for (let j = 0; j < n - 1; j++) v[j] = w[j * n + n - 1];
  let h = householderVector(v, n - 1, e);
  for (let i = n - 1; i > 0; i--) {
    if (h === 0) {
      // Row i is already zero left of the diagonal: nothing to reflect; the next row as it stands.
      ready = false;
      if (i > 1) {
        for (let j = 0; j < i - 1; j++) v[j] = w[j * n + i - 1];
        h = householderVector(v, i - 1, e);
      }
      continue;
    }
    u.set(v.subarray(0, i));
    halfNorms[i] = h;
    w.set(u.subarray(0, i), i * n); // the upper slots of column i are free
    if (!ready) blockTimes(w, n, i, u, p);
    // p = A u / h; q = p - (u'p / 2h) u; A <- A - u q' - q u' (the Householder update).
    let f = 0;
    for (let j = 0; j < i; j++) {
      p[j] /= h;
      f += p[j] * u[j];
    }
    const hh = f / (h + h);
    for (let j = 0; j < i; j++) q[j] = p[j] - hh * u[j];
    // Row i-1 first: it gives the next reflector.
    const last = i - 1;
    const ul = u[last];
    const ql = q[last];
    for (let j = 0; j <= last; j++) w[j * n + last] -= u[j] * ql + q[j] * ul;
    if (last === 0) break;
    for (let j = 0; j < last; j++) v[j] = w[j * n + last];
    h = householderVector(v, last, e);
    if (h === 0) {
      for (let j = 0; j < last; j++) {
        const col = j * n;
        const uj = u[j];
        const qj = q[j];
        for (let k = j; k < last; k++) w[col + k] -= uj * q[k] + qj * u[k];
      }
      ready = false;
      continue;
    }
    const split = passSplit(last);
    p.fill(0, 0, last);
    const mine = () => fusedColumns(w, n, last, 0, split, u, q, v, p);
    const theirs = () => passShare([w, u, q, v, p2], [n, last, split]);
    if (last < MIN_SHARED_PASS) {
      mine();
      theirs();
    } else
      inTwoShares(
        team,
        { kernel: TRIDIAGONAL_PASS_SHARE, buffers: [w, u, q, v, p2], ints: [n, last, split] },
        mine,
        theirs,
      );
    for (let k = split; k < last; k++) p[k] += p2[k];
    ready = true;
  }
  for (let j = 0; j < n; j++) d[j] = w[j * n + j];
  return { n, diagonal: d, offDiagonal: e, reflectors: w, halfNorms };
}

/**
 * The reduction in the WebAssembly module (tridiagonal.c): the matrix copied into its memory once,
 * then one call a step (the steps' first calls run unoptimised code, the rest optimised), then
 * the form copied out. On the kernel team's shared memory, passes from MIN_SHARED_WASM_PASS
 * columns split in the same two column ranges as the TypeScript's, the second on the helper.
 */
function tridiagonalFormInWasm(m: Matrix, wasm: WasmKernels): TridiagonalForm {
  const n = m.rows;
  const [w, u, q, v, p, p2, e, halfNorms, state] = wasm.views(n * n, n, n, n, n, n, n, n, 2);
  // The module's memory holds whatever the last kernel left there: each column's lower part is
  // copied in, and every step writes its reflector slots above it (zeros where it has none).
  e.fill(0);
  halfNorms.fill(0);
  for (let j = 0; j < n; j++) w.set(m.data.subarray(j * n + j, j * n + n), j * n + j);
  const kernels = wasm.exports;
  const [W, U, Q, V, P, P2, E, H, S] = [w, u, q, v, p, p2, e, halfNorms, state].map((a) => a.byteOffset);
  if (n > 1) kernels.tridiagonal_begin(W, n, V, E, S);
  const team = wasm.shared && n > MIN_SHARED_WASM_PASS ? kernelTeam() : null;
  for (let i = n - 1; i > 0; i--) {
    const last = i - 1;
    if (!team || last < MIN_SHARED_WASM_PASS) {
      kernels.tridiagonal_steps(W, n, U, Q, V, P, P2, E, H, S, i, i - 1);
      continue;
    }
    const split = kernels.tridiagonal_step_to_pass(W, n, i, U, Q, V, P, E, H, S);
    if (split < 0) continue;
    inTwoShares(
      team,
      { kernel: TRIDIAGONAL_WASM_PASS_SHARE, buffers: [w, u, q, v, p2], ints: [n, last, split] },
      () => kernels.tridiagonal_pass_mine(W, n, last, split, U, Q, V, P),
      () => kernels.tridiagonal_pass_share(W, n, last, split, U, Q, V, P2),
    );
    kernels.tridiagonal_pass_end(P, P2, split, last, S);
  }
  const diagonal = new Float64Array(n);
  for (let j = 0; j < n; j++) diagonal[j] = w[j * n + j];
  return { n, diagonal, offDiagonal: e.slice(), reflectors: w.slice(), halfNorms: halfNorms.slice() };
}

/**
 * Passes over fewer columns than this stay on one thread in WebAssembly: a pass of 512 columns
 * takes about 80 us there, no more than the hand-over and the helper's wake-up save.
 */
const MIN_SHARED_WASM_PASS = 768;

/** The kernel team's name for the second column range of a WebAssembly pass (see wasmPassShare). */
export const TRIDIAGONAL_WASM_PASS_SHARE = 'tridiagonal-pass-wasm';

/**
 * The helper's share of a WebAssembly pass: buffers [w, u, q, v, p2] on the team's memory, ints
 * [n, m, split]. A helper whose module did not load makes it in TypeScript, the same sums.
 */
export function wasmPassShare(buffers: readonly Float64Array[], ints: readonly number[]): void {
  const wasm = helperKernels();
  if (!wasm) return passShare(buffers, ints);
  const [w, u, q, v, p2] = buffers.map((a) => a.byteOffset);
  const [n, m, split] = ints;
  wasm.exports.tridiagonal_pass_share(w, n, m, split, u, q, v, p2);
}

/** The kernel team's name for the second column range of a pass (see passShare). */
export const TRIDIAGONAL_PASS_SHARE = 'tridiagonal-pass';

/**
 * Passes over fewer columns than this stay on one thread: a pass of m columns is about m^2 / 2
 * multiply-adds, and below m = 512 the hand-over and the wake-up cost a tenth of its time or more.
 */
const MIN_SHARED_PASS = 512;

/**
 * A pass's second column range [split, m) into p2 (zeroed first): buffers [w, u, q, v, p2], ints
 * [n, m, split].
 */
export function passShare(buffers: readonly Float64Array[], ints: readonly number[]): void {
  const [w, u, q, v, p2] = buffers;
  const [n, m, split] = ints;
  p2.fill(0, 0, m);
  fusedColumns(w, n, m, split, m, u, q, v, p2);
}

/**
 * Turns row r[0..m-1] into its Householder vector in place (scaled by 1 / sum |r|, the last entry
 * shifted by the new off-diagonal, as tred2 does), writes that off-diagonal to e[m] and returns
 * h = u'u / 2, or 0 when the row is already zero.
 */
export function householderVector(r: Float64Array, m: number, e: Float64Array): number {
  let scale = 0;
  for (let k = 0; k < m; k++) scale += Math.abs(r[k]);
  if (scale === 0) {
    e[m] = 0;
    return 0;
  }
  let h = 0;
  for (let k = 0; k < m; k++) {
    r[k] /= scale;
    h += r[k] * r[k];
  }
  const f = r[m - 1];
  let g = Math.sqrt(h);
  if (f > 0) g = -g;
  e[m] = scale * g;
  h -= f * g;
  r[m - 1] = f - g;
  return h;
}

/** out = A u on the leading m x m block, from the lower triangle's columns. */
function blockTimes(w: Float64Array, n: number, m: number, u: Float64Array, out: Float64Array): void {
  out.fill(0, 0, m);
  for (let j = 0; j < m; j++) {
    const col = j * n;
    const uj = u[j];
    let g = w[col + j] * uj;
    for (let k = j + 1; k < m; k++) {
      g += w[col + k] * u[k];
      out[k] += w[col + k] * uj;
    }
    out[j] += g;
  }
}

/**
 * Columns [from, to) of one step's pass over the leading m x m block: A -= u q' + q u' on the
 * lower triangle, and p += A v with the updated entries (v = the next reflector). Two columns at a
 * time, so that each load of u, q, v and p serves two entries of A: about 1.6x faster in V8 than
 * the two passes of tred2 at N = 1500 on this project's machines.
 */
function fusedColumns(
  w: Float64Array,
  n: number,
  m: number,
  from: number,
  to: number,
  u: Float64Array,
  q: Float64Array,
  v: Float64Array,
  p: Float64Array,
): void {
  let j = from;
  for (; j + 1 < to; j += 2) {
    const c0 = j * n;
    const c1 = c0 + n;
    const u0 = u[j];
    const q0 = q[j];
    const v0 = v[j];
    const u1 = u[j + 1];
    const q1 = q[j + 1];
    const v1 = v[j + 1];
    // The corner A[j][j], A[j+1][j], A[j+1][j+1].
    const a00 = w[c0 + j] - 2 * u0 * q0;
    const a10 = w[c0 + j + 1] - (u0 * q1 + q0 * u1);
    const a11 = w[c1 + j + 1] - 2 * u1 * q1;
    w[c0 + j] = a00;
    w[c0 + j + 1] = a10;
    w[c1 + j + 1] = a11;
    let g0 = a00 * v0 + a10 * v1;
    let g1 = a10 * v0 + a11 * v1;
    let h0 = 0;
    let h1 = 0;
    let k = j + 2;
    for (; k + 1 < m; k += 2) {
      const qk = q[k];
      const uk = u[k];
      const vk = v[k];
      const ql = q[k + 1];
      const ul = u[k + 1];
      const vl = v[k + 1];
      const x0 = w[c0 + k] - (u0 * qk + q0 * uk);
      const y0 = w[c1 + k] - (u1 * qk + q1 * uk);
      const x1 = w[c0 + k + 1] - (u0 * ql + q0 * ul);
      const y1 = w[c1 + k + 1] - (u1 * ql + q1 * ul);
      w[c0 + k] = x0;
      w[c1 + k] = y0;
      w[c0 + k + 1] = x1;
      w[c1 + k + 1] = y1;
      g0 += x0 * vk;
      g1 += y0 * vk;
      h0 += x1 * vl;
      h1 += y1 * vl;
      p[k] += x0 * v0 + y0 * v1;
      p[k + 1] += x1 * v0 + y1 * v1;
    }
    if (k < m) {
      const x0 = w[c0 + k] - (u0 * q[k] + q0 * u[k]);
      const y0 = w[c1 + k] - (u1 * q[k] + q1 * u[k]);
      w[c0 + k] = x0;
      w[c1 + k] = y0;
      g0 += x0 * v[k];
      g1 += y0 * v[k];
      p[k] += x0 * v0 + y0 * v1;
    }
    p[j] += g0 + h0;
    p[j + 1] += g1 + h1;
  }
  if (j < to) {
    const col = j * n;
    const uj = u[j];
    const qj = q[j];
    const vj = v[j];
    const a = w[col + j] - 2 * uj * qj;
    w[col + j] = a;
    let g = a * vj;
    for (let k = j + 1; k < m; k++) {
      const x = w[col + k] - (uj * q[k] + qj * u[k]);
      w[col + k] = x;
      g += x * v[k];
      p[k] += x * vj;
    }
    p[j] += g;
  }
}

/** y = Q'v: the coordinates of v in the basis in which A is tridiagonal (O(N^2)). */
export function intoTridiagonalBasis(form: TridiagonalForm, v: ArrayLike<number>): Float64Array {
  const { n, reflectors, halfNorms } = form;
  if (v.length !== n) throw new RangeError(`expected ${n} entries, got ${v.length}`);
  const y = Float64Array.from(v);
  // T = H_1 ... H_{n-1} A H_{n-1} ... H_1, so Q' = H_1 ... H_{n-1}: H_{n-1} acts first.
  for (let i = n - 1; i > 0; i--) {
    const h = halfNorms[i];
    if (h === 0) continue;
    const row = i * n;
    let s = 0;
    for (let j = 0; j < i; j++) s += reflectors[row + j] * y[j];
    s /= h;
    for (let j = 0; j < i; j++) y[j] -= s * reflectors[row + j];
  }
  return y;
}
