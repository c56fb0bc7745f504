/**
 * Dense factorisations on row-major Float64Arrays: Cholesky for the interior point's normal
 * equations and polishing's augmented Hessian (equality-kkt.ts), LU with partial pivoting for the
 * core's other dense solves (erc.ts, the Sharpe-ratio test). Plain loops over contiguous rows:
 * the inner loop of both is a dot product on adjacent memory.
 *
 * Each inner loop is a small function of its own (the dot products shared with the rest of the
 * solver, kernels.ts). A command-line run solves once in a fresh process, so most of the
 * factorisation work happens before V8 has optimised anything; a small function called thousands
 * of times is optimised after its first few calls with complete type feedback, where one long
 * function is compiled on the fly part-way through its loop, at length, and often thrown away
 * again when it reaches code it had not run yet (measured on Node 20: the N = 500 bench's first
 * solve). The sums are the same, in the same order, as in one function.
 */
import { inTwoShares, kernelTeam, type KernelTeam } from '../../linalg/kernel-team.js';
import { helperKernels, wasmKernels, type WasmKernels } from '../../linalg/wasm/wasm-kernels.js';
import { maxAbs, subtractDot } from './kernels.js';

/** a[rj + j] - sum_k a[rj + k]^2 over k < j, with two partial sums (even and odd k). */
function pivotSquare(a: Float64Array, rj: number, j: number): number {
  let d0 = a[rj + j];
  let d1 = 0;
  let k = 0;
  for (; k + 1 < j; k += 2) {
    d0 -= a[rj + k] * a[rj + k];
    d1 -= a[rj + k + 1] * a[rj + k + 1];
  }
  if (k < j) d0 -= a[rj + k] * a[rj + k];
  return d0 + d1;
}

/**
 * Columns j and j + 1 of L in rows ri to ri + 3 at once: eight dot products over m < j share
 * each load of the two pivot rows (eight multiply-adds on eight independent sums per six loads),
 * then column j + 1 takes its last term, L_ij L_(j+1)j. `ljj`, `l1j` and `l11` are L's entries
 * (j, j), (j + 1, j) and (j + 1, j + 1).
 */
function fourRowsOfTwoColumns(
  a: Float64Array,
  ri: number,
  rj: number,
  j: number,
  n: number,
  ljj: number,
  l1j: number,
  l11: number,
): void {
  const r1 = rj + n;
  const rb = ri + n;
  const rc = rb + n;
  const rd = rc + n;
  let s0 = a[ri + j];
  let s1 = a[ri + j + 1];
  let t0 = a[rb + j];
  let t1 = a[rb + j + 1];
  let u0 = a[rc + j];
  let u1 = a[rc + j + 1];
  let v0 = a[rd + j];
  let v1 = a[rd + j + 1];
  for (let m = 0; m < j; m++) {
    const x = a[rj + m];
    const y = a[r1 + m];
    const p = a[ri + m];
    const q = a[rb + m];
    const r = a[rc + m];
    const w = a[rd + m];
    s0 -= p * x;
    s1 -= p * y;
    t0 -= q * x;
    t1 -= q * y;
    u0 -= r * x;
    u1 -= r * y;
    v0 -= w * x;
    v1 -= w * y;
  }
  finishTwoColumns(a, ri + j, s0, s1, ljj, l1j, l11);
  finishTwoColumns(a, rb + j, t0, t1, ljj, l1j, l11);
  finishTwoColumns(a, rc + j, u0, u1, ljj, l1j, l11);
  finishTwoColumns(a, rd + j, v0, v1, ljj, l1j, l11);
}

/** L's entries in columns j and j + 1 of one row (at o and o + 1) from its two finished sums. */
function finishTwoColumns(
  a: Float64Array,
  o: number,
  s0: number,
  s1: number,
  ljj: number,
  l1j: number,
  l11: number,
): void {
  const li = s0 / ljj;
  a[o] = li;
  a[o + 1] = (s1 - li * l1j) / l11;
}

/** The same for one row (the last one to three rows). */
function oneRowOfTwoColumns(
  a: Float64Array,
  ri: number,
  rj: number,
  j: number,
  n: number,
  ljj: number,
  l1j: number,
  l11: number,
): void {
  const r1 = rj + n;
  let s0 = a[ri + j];
  let s1 = a[ri + j + 1];
  for (let m = 0; m < j; m++) {
    const u = a[ri + m];
    s0 -= u * a[rj + m];
    s1 -= u * a[r1 + m];
  }
  finishTwoColumns(a, ri + j, s0, s1, ljj, l1j, l11);
}

/**
 * In-place Cholesky A = L L' of an n x n symmetric matrix (lower triangle used). False when not
 * positive definite. Left-looking, two columns of L at a time and four rows within them: each
 * inner step loads four entries of the rows being computed and two of the pivot rows and makes
 * eight multiply-adds on eight independent sums. Median CPU time over 7 alternating runs, in
 * Node 20: two columns and two rows against one column were 1.27x as fast at n = 1500 and 1.22x
 * at n = 600; four rows against two, 1.20x (n = 300), 1.24x (600) and 1.20x (1500), with the
 * same sums in the same order (the same factor, bit for bit). Six rows were no faster than four.
 *
 * The columns go in blocks of CHOLESKY_BLOCK: the block's own rows first, then every row below
 * it across the whole block. Each entry is still the same sum in the same order (a row's entries
 * in a block need only its earlier entries and the block's pivot rows), so the factor is the one
 * column pair at a time gives, bit for bit; but the rows below a block are independent of one
 * another, and with a kernel team (linalg/kernel-team.ts) the helper thread takes half of them.
 *
 * Where the WebAssembly kernels run, from order 32, the same blocks run there (choleskyInWasm):
 * a quarter of the TypeScript's time at n = 300 to 1501 on one thread (optimise/README.md,
 * "WebAssembly kernels"), and the factor stays in the module's memory for its solves.
 */
export function choleskyInPlace(a: Float64Array, n: number): boolean {
  if (resident?.l === a) resident = null;
  const wasm = n >= MIN_WASM_ORDER ? wasmKernels() : null;
  if (wasm) return choleskyInWasm(a, n, wasm);
  const team = n >= MIN_SHARED_ORDER ? kernelTeam() : null;
  if (!team) return choleskyBlocks(a, n, null);
  const shared = team.shared(n * n);
  shared.set(a.subarray(0, n * n));
  const factored = choleskyBlocks(shared, n, team);
  a.set(shared);
  return factored;
}

/**
 * The factor by the WebAssembly kernels (linalg/wasm/cholesky.c), the same sums in the same order:
 * per block, one call for its own rows and one per ROWS_PER_CALL rows below it, so that V8's
 * optimised code (which serves only calls after the first few) does most of the work. A copy of
 * `a` in and out of the module's memory is O(n^2) against the factor's O(n^3). On a matrix that
 * is not positive definite `a` is left as the TypeScript leaves it (the columns before the failing
 * pivot factored). On the kernel team's shared memory, from MIN_SHARED_ORDER, the rows below a
 * block split in two shares as the TypeScript's do. With both cores free (the other processes
 * paused) that took `holdfast solve` at N = 1500, cap 0.1 %, from 1795 to 1485 ms (medians of 5
 * alternating runs; solver 1066 -> 772 ms); with the cores busy with other work the split lost
 * (solver 1181-1762 ms on one thread against 1371-1978 on two, load 7-10), since each share then
 * waits for a core.
 */
function choleskyInWasm(a: Float64Array, n: number, wasm: WasmKernels): boolean {
  const [m, pairs] = wasm.views(n * n, CHOLESKY_BLOCK * n);
  m.set(a.subarray(0, n * n));
  const team = wasm.shared && n >= MIN_SHARED_ORDER ? kernelTeam() : null;
  let factored = true;
  for (let j0 = 0; j0 < n && factored; j0 += CHOLESKY_BLOCK) {
    const j1 = Math.min(n, j0 + CHOLESKY_BLOCK);
    factored = wasm.exports.cholesky_diagonal_block(m.byteOffset, n, j0, j1, pairs.byteOffset) === 1;
    const rows = n - j1;
    if (!factored || rows === 0) continue;
    const mid = j1 + 4 * Math.floor(rows / 8);
    if (!team || rows * (j1 - j0) * j1 < MIN_SHARED_WASM_ROWS_WORK) wasmRowsBelow(wasm, m, n, j0, j1, j1, n, pairs);
    else
      inTwoShares(
        team,
        { kernel: CHOLESKY_ROWS_WASM_SHARE, buffers: [m, pairs], ints: [n, j0, j1, j1, mid] },
        () => wasmRowsBelow(wasm, m, n, j0, j1, mid, n, pairs),
        () => wasmRowsBelow(wasm, m, n, j0, j1, j1, mid, pairs),
      );
  }
  a.set(m);
  if (factored) resident = { wasm, l: a, n, taken: wasm.viewsTaken };
  return factored;
}

/**
 * The factor the WebAssembly kernels last made, still in their memory (at the start of the first
 * view) while no kernel has taken views of that instance since: its solves then need only b
 * copied in. The array is the caller's, which the factor's contract leaves as choleskyInPlace
 * made it.
 */
let resident: { wasm: WasmKernels; l: Float64Array; n: number; taken: number } | null = null;

/**
 * Views of L and b in the module's memory for a solve by the WebAssembly kernels, L copied in
 * unless it is the resident factor (a copy is cheaper than the solve it speeds up, and it makes
 * L resident for the next solve); null where they do not run or n is below MIN_WASM_ORDER.
 */
function solveViews(
  l: Float64Array,
  n: number,
  b: Float64Array,
): { wasm: WasmKernels; lv: Float64Array; bv: Float64Array } | null {
  const wasm = n >= MIN_WASM_ORDER ? wasmKernels() : null;
  if (!wasm) return null;
  const inPlace =
    resident !== null &&
    resident.wasm === wasm &&
    resident.l === l &&
    resident.n === n &&
    resident.taken === wasm.viewsTaken;
  const [lv, bv] = wasm.views(n * n, n);
  if (!inPlace) lv.set(l.subarray(0, n * n));
  resident = { wasm, l, n, taken: wasm.viewsTaken };
  bv.set(b.subarray(0, n));
  return { wasm, lv, bv };
}

/**
 * Below one block's order the factor and its solves stay in TypeScript: their work is less than
 * the calls' and copies', and a small factor (a Schur complement's, factored between a large
 * factor and its solves) would take the module's memory from the large one.
 */
const MIN_WASM_ORDER = 32;

/** Rows of a triangular solve per call of the WebAssembly kernels (a multiple of eight, both kernels' rows per step). */
const SOLVE_ROWS_PER_CALL = 64;

/** L y = b by the WebAssembly kernel, rows [first, n), SOLVE_ROWS_PER_CALL a call. */
function forwardInWasm(wasm: WasmKernels, lv: Float64Array, n: number, bv: Float64Array, first: number): void {
  for (let i0 = first; i0 < n; i0 += SOLVE_ROWS_PER_CALL)
    wasm.exports.cholesky_forward_rows(
      lv.byteOffset,
      n,
      bv.byteOffset,
      first,
      i0,
      Math.min(n, i0 + SOLVE_ROWS_PER_CALL),
    );
}

/** L' x = y by the WebAssembly kernel, from the last row up, SOLVE_ROWS_PER_CALL a call. */
function backInWasm(wasm: WasmKernels, lv: Float64Array, n: number, bv: Float64Array): void {
  for (let i1 = n; i1 > 0; i1 -= SOLVE_ROWS_PER_CALL)
    wasm.exports.cholesky_back_rows(lv.byteOffset, n, bv.byteOffset, Math.max(0, i1 - SOLVE_ROWS_PER_CALL), i1);
}

/** Rows [r0, r1) below the block [j0, j1) by the WebAssembly kernel, ROWS_PER_CALL a call. */
function wasmRowsBelow(
  wasm: WasmKernels,
  m: Float64Array,
  n: number,
  j0: number,
  j1: number,
  r0: number,
  r1: number,
  pairs: Float64Array,
): void {
  for (let i = r0; i < r1; i += ROWS_PER_CALL)
    wasm.exports.cholesky_rows_below(m.byteOffset, n, j0, j1, i, Math.min(r1, i + ROWS_PER_CALL), pairs.byteOffset);
}

/** The kernel team's name for a share of the rows below a block in WebAssembly (see choleskyRowsWasmShare). */
export const CHOLESKY_ROWS_WASM_SHARE = 'cholesky-rows-wasm';

/**
 * The helper's share of the rows below a block by the WebAssembly kernel: buffers [a, pairs] on
 * the team's memory, ints as choleskyRowsShare's. A helper whose module did not load makes it in
 * TypeScript, the same sums.
 */
export function choleskyRowsWasmShare(buffers: readonly Float64Array[], ints: readonly number[]): void {
  const wasm = helperKernels();
  if (wasm) wasmRowsBelow(wasm, buffers[0], ints[0], ints[1], ints[2], ints[3], ints[4], buffers[1]);
  else rowsBelowBlock(buffers[0], ints[0], ints[1], ints[2], ints[3], ints[4]);
}

/**
 * Below this many multiply-adds a block's rows below stay on one thread in WebAssembly, four times
 * the TypeScript's threshold: the kernel is some 3.5 times as fast, the hand-over the same.
 */
const MIN_SHARED_WASM_ROWS_WORK = 1 << 20;

/** Rows below a block per call of the WebAssembly kernel (a multiple of four, its rows per step). */
const ROWS_PER_CALL = 64;

/** Columns per block: 32 keeps a block's pivot rows (32 x n) in the second-level cache to n = 4000. */
const CHOLESKY_BLOCK = 32;

/**
 * Below this order the factor stays on one thread: at n = 501 (the bench's N = 500 problems
 * solved whole) the second thread's start cost as much as its shares saved over a solve.
 */
const MIN_SHARED_ORDER = 640;

/** Below this many multiply-adds a block's rows below stay on one thread: the hand-over costs more. */
const MIN_SHARED_ROWS_WORK = 1 << 18;

/** The kernel team's name for a share of the rows below a block (see choleskyRowsShare). */
export const CHOLESKY_ROWS_SHARE = 'cholesky-rows';

/** The helper's share: buffers [a], ints [n, first column, end column, first row, end row]. */
export function choleskyRowsShare(buffers: readonly Float64Array[], ints: readonly number[]): void {
  rowsBelowBlock(buffers[0], ints[0], ints[1], ints[2], ints[3], ints[4]);
}

/** With a team, `a` is on its shared memory and the rows below a block may be split. */
function choleskyBlocks(a: Float64Array, n: number, team: KernelTeam | null): boolean {
  for (let j0 = 0; j0 < n; j0 += CHOLESKY_BLOCK) {
    const j1 = Math.min(n, j0 + CHOLESKY_BLOCK);
    if (!diagonalBlock(a, n, j0, j1)) return false;
    const rows = n - j1;
    if (rows === 0) break;
    // Split on a multiple of four rows, so each share keeps the four-row kernel.
    const mid = j1 + 4 * Math.floor(rows / 8);
    if (!team || rows * (j1 - j0) * j1 < MIN_SHARED_ROWS_WORK) rowsBelowBlock(a, n, j0, j1, j1, n);
    else
      inTwoShares(
        team,
        { kernel: CHOLESKY_ROWS_SHARE, buffers: [a], ints: [n, j0, j1, j1, mid] },
        () => rowsBelowBlock(a, n, j0, j1, mid, n),
        () => rowsBelowBlock(a, n, j0, j1, j1, mid),
      );
  }
  return true;
}

/** Columns [j0, j1) of L on rows [j0, j1): the block's pivots, two columns at a time. */
function diagonalBlock(a: Float64Array, n: number, j0: number, j1: number): boolean {
  let j = j0;
  for (; j + 1 < j1; j += 2) {
    const rj = j * n;
    const d = pivotSquare(a, rj, j);
    if (!(d > 0) || !Number.isFinite(d)) return false;
    const ljj = Math.sqrt(d);
    a[rj + j] = ljj;
    const r1 = rj + n;
    const l1j = subtractDot(a[r1 + j], a, r1, a, rj, j) / ljj;
    a[r1 + j] = l1j;
    const d1 = pivotSquare(a, r1, j + 1);
    if (!(d1 > 0) || !Number.isFinite(d1)) return false;
    const l11 = Math.sqrt(d1);
    a[r1 + j + 1] = l11;
    let i = j + 2;
    for (; i + 3 < j1; i += 4) fourRowsOfTwoColumns(a, i * n, rj, j, n, ljj, l1j, l11);
    for (; i < j1; i++) oneRowOfTwoColumns(a, i * n, rj, j, n, ljj, l1j, l11);
  }
  if (j < j1) {
    // The last column of an odd order: its pivot alone (no row below it).
    const rj = j * n;
    const d = pivotSquare(a, rj, j);
    if (!(d > 0) || !Number.isFinite(d)) return false;
    a[rj + j] = Math.sqrt(d);
  }
  return true;
}

/** Columns [j0, j1) of L (j1 - j0 even) on rows [r0, r1), below the block. */
function rowsBelowBlock(a: Float64Array, n: number, j0: number, j1: number, r0: number, r1: number): void {
  let i = r0;
  for (; i + 3 < r1; i += 4) {
    const ri = i * n;
    for (let j = j0; j + 1 < j1; j += 2) {
      const rj = j * n;
      fourRowsOfTwoColumns(a, ri, rj, j, n, a[rj + j], a[rj + n + j], a[rj + n + j + 1]);
    }
  }
  for (; i < r1; i++) {
    const ri = i * n;
    for (let j = j0; j + 1 < j1; j += 2) {
      const rj = j * n;
      oneRowOfTwoColumns(a, ri, rj, j, n, a[rj + j], a[rj + n + j], a[rj + n + j + 1]);
    }
  }
}

/**
 * b[i] - sum_k l[k n + i] b[k] over k from n - 1 down to i + 1: column i of L below the diagonal,
 * from the bottom up, the order in which the WebAssembly kernel sums eight rows at once.
 */
function subtractColumnDot(l: Float64Array, n: number, i: number, b: Float64Array): number {
  let s = b[i];
  for (let k = n - 1; k > i; k--) s -= l[k * n + i] * b[k];
  return s;
}

/**
 * b_i = (b_i - sum_{k<i} L_ik b_k) / L_ii for i = 0 .. n-1: L y = b. Entries of b before its
 * first non-zero stay zero, so the sums start there (a sparse right-hand side, as a constraint
 * row is, costs only the rows below its first entry); the terms skipped are exact zeros.
 */
export function forwardSubstitute(l: Float64Array, n: number, b: Float64Array): void {
  const first = firstNonZero(b, n);
  if (first === n) return;
  const w = solveViews(l, n, b);
  if (!w) return forwardInTypeScript(l, n, b, first);
  forwardInWasm(w.wasm, w.lv, n, w.bv, first);
  b.set(w.bv);
}

/** b_i = (b_i - sum_{k>i} L_ki b_k) / L_ii for i = n-1 .. 0: L' x = y. */
export function backSubstituteTransposed(l: Float64Array, n: number, b: Float64Array): void {
  const w = solveViews(l, n, b);
  if (!w) return backInTypeScript(l, n, b);
  backInWasm(w.wasm, w.lv, n, w.bv);
  b.set(w.bv);
}

/** Solves L L' x = b in place (b overwritten by x) with the factor from choleskyInPlace, unchanged since. */
export function choleskySolveInPlace(l: Float64Array, n: number, b: Float64Array): void {
  const first = firstNonZero(b, n);
  const w = solveViews(l, n, b);
  if (!w) {
    forwardInTypeScript(l, n, b, first);
    return backInTypeScript(l, n, b);
  }
  forwardInWasm(w.wasm, w.lv, n, w.bv, first);
  backInWasm(w.wasm, w.lv, n, w.bv);
  b.set(w.bv);
}

/** The index of b's first non-zero entry among the first n (n when there is none). */
function firstNonZero(b: Float64Array, n: number): number {
  let first = 0;
  while (first < n && b[first] === 0) first++;
  return first;
}

function forwardInTypeScript(l: Float64Array, n: number, b: Float64Array, first: number): void {
  for (let i = first; i < n; i++) b[i] = subtractDot(b[i], l, i * n + first, b, first, i - first) / l[i * n + i];
}

function backInTypeScript(l: Float64Array, n: number, b: Float64Array): void {
  for (let i = n - 1; i >= 0; i--) b[i] = subtractColumnDot(l, n, i, b) / l[i * n + i];
}

export interface LuFactor {
  lu: Float64Array;
  perm: Int32Array;
  n: number;
}

function swapRows(lu: Float64Array, rk: number, rp: number, n: number): void {
  for (let j = 0; j < n; j++) {
    const t = lu[rk + j];
    lu[rk + j] = lu[rp + j];
    lu[rp + j] = t;
  }
}

/**
 * LU with partial pivoting of `lu` itself (overwritten); null when a pivot vanishes.
 *
 * Crout's order (the left-looking form in Golub and Van Loan's Matrix Computations; recalled from
 * memory): step k finishes column k of L and row k of U, each entry one dot product of a row of L
 * with a column of U, its terms subtracted in increasing order. Those are the subtractions of
 * eliminating row by row, in the same order, so the factor is the same; the one difference, that
 * a zero multiplier's terms are subtracted rather than skipped, can only change the sign of a zero.
 * U is also kept by columns (`ut`) so that every dot product runs over adjacent memory, and they
 * all go through the one kernel the triangular solves use (kernels.ts), which the interior
 * point's Cholesky solves have made fast by the time polishing factors.
 */
export function luFactorInPlace(lu: Float64Array, n: number): LuFactor | null {
  const perm = new Int32Array(n);
  for (let i = 0; i < n; i++) perm[i] = i;
  const tiny = maxAbs(lu) * 1e-300 + 1e-300;
  const ut = new Float64Array(n * n); // ut[j n + m] = U[m][j] for m <= j
  for (let k = 0; k < n; k++) {
    const rk = k * n;
    const p = columnOfL(lu, ut, n, k);
    if (!(Math.abs(lu[p * n + k]) > tiny)) return null;
    if (p !== k) {
      swapRows(lu, rk, p * n, n);
      const t = perm[k];
      perm[k] = perm[p];
      perm[p] = t;
    }
    rowOfU(lu, ut, n, k);
    scaleBelow(lu, n, k, 1 / lu[rk + k]);
  }
  return { lu, perm, n };
}

/** Column k of L (rows k..) less (row of L) . (column k of U); the row of the first of its largest entries. */
function columnOfL(lu: Float64Array, ut: Float64Array, n: number, k: number): number {
  let p = k;
  let best = 0;
  for (let i = k; i < n; i++) {
    const v = subtractDot(lu[i * n + k], lu, i * n, ut, k * n, k);
    lu[i * n + k] = v;
    if (i === k || Math.abs(v) > best) {
      best = Math.abs(v);
      p = i;
    }
  }
  return p;
}

/** Row k of U after the diagonal, kept by columns in ut as well. */
function rowOfU(lu: Float64Array, ut: Float64Array, n: number, k: number): void {
  const rk = k * n;
  ut[rk + k] = lu[rk + k];
  for (let j = k + 1; j < n; j++) {
    const v = subtractDot(lu[rk + j], lu, rk, ut, j * n, k);
    lu[rk + j] = v;
    ut[j * n + k] = v;
  }
}

/** Column k of L below the diagonal divided by the pivot (times inv = 1 / pivot); zeros left as they are. */
function scaleBelow(lu: Float64Array, n: number, k: number, inv: number): void {
  for (let i = k + 1; i < n; i++) {
    const f = lu[i * n + k] * inv;
    if (f !== 0) lu[i * n + k] = f;
  }
}

/** LU with partial pivoting of a copy of `a`; null when a pivot vanishes (singular to working precision). */
export function luFactor(a: Float64Array, n: number): LuFactor | null {
  return luFactorInPlace(Float64Array.from(a), n);
}

/** x_i = b_perm(i) */
function permuted(x: Float64Array, b: ArrayLike<number>, perm: Int32Array): void {
  for (let i = 0; i < perm.length; i++) x[i] = b[perm[i]];
}

/** x_i -= sum_{k<i} L_ik x_k for i = 0 .. n-1 (L unit lower, below the diagonal of lu). */
function unitForwardSubstitute(lu: Float64Array, n: number, x: Float64Array): void {
  for (let i = 0; i < n; i++) x[i] = subtractDot(x[i], lu, i * n, x, 0, i);
}

/** x_i = (x_i - sum_{k>i} U_ik x_k) / U_ii for i = n-1 .. 0. */
function backSubstitute(lu: Float64Array, n: number, x: Float64Array): void {
  for (let i = n - 1; i >= 0; i--) x[i] = subtractDot(x[i], lu, i * n + i + 1, x, i + 1, n - i - 1) / lu[i * n + i];
}

/** x = A^-1 b into `x` (length n, not `b` itself), with the factor from luFactor. */
export function luSolveInto(f: LuFactor, b: ArrayLike<number>, x: Float64Array): Float64Array {
  permuted(x, b, f.perm);
  unitForwardSubstitute(f.lu, f.n, x);
  backSubstitute(f.lu, f.n, x);
  return x;
}

export function luSolve(f: LuFactor, b: ArrayLike<number>): Float64Array {
  return luSolveInto(f, b, new Float64Array(f.n));
}
