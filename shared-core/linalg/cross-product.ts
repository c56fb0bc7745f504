import { inTwoShares, kernelTeam, sharedArray } from './kernel-team.js';
import { zeros, type Matrix } from './matrix.js';
import { helperKernels, wasmKernels, type WasmKernels } from './wasm/wasm-kernels.js';

/**
 * The cross product C = X'X of a T x N matrix (the symmetric rank-k update of BLAS, "syrk"):
 * the one O(N^2 T) step of every covariance estimator here. Written for speed in plain
 * TypeScript: X is packed into column panels stored period by period, so the inner loop reads
 * two contiguous streams, and each pass of the inner loop updates a 4 x 4 block of C held in
 * sixteen local accumulators (register blocking: eight loads feed sixteen multiply-adds).
 * Periods are taken 512 at a time so a pass's panels stay in cache. Of the 2 x 4, 3 x 4 and
 * 4 x 4 blocks measured on this machine, 4 x 4 was fastest. Only the lower triangle is
 * computed (N(N+1)/2 T multiply-adds) and then mirrored.
 *
 * Where the WebAssembly kernels run (wasm/wasm-kernels.ts) the blocks are made there, two entries
 * of a row per SIMD lane pair, the same sums in the same order: at N = 500, T = 1260 the product
 * took 28-32 ms against 85-90 ms here, and at N = 1500 181-196 ms against 642 ms (one thread
 * each; fresh processes, Node 20). Without them, and with a kernel team (kernel-team.ts), the row
 * panels split in two shares of equal work, each block summed as on one thread.
 */
export function crossProduct(x: Matrix): Matrix {
  const wasm = wasmKernels();
  if (wasm) return crossProductInWasm(x, wasm);
  const t = x.rows;
  const n = x.cols;
  const panels = Math.ceil(n / PANEL);
  const team = n * n * t < MIN_SHARED_WORK ? null : kernelTeam();
  // X packed once: its column panels serve as the row panels too (both are PANEL wide).
  const packed = sharedArray(team, panels * PANEL * t);
  packPanels(x, PANEL, packed);
  const out = sharedArray(team, n * n);
  // Row panel I has I + 1 blocks: the first `split` panels hold half of the blocks.
  const split = team ? Math.round(panels * Math.SQRT1_2) : panels;
  inTwoShares(
    team,
    { kernel: CROSS_PRODUCT_SHARE, buffers: [packed, out], ints: [t, n, split, panels] },
    () => crossProductPanels(packed, out, t, n, 0, split),
    () => crossProductPanels(packed, out, t, n, split, panels),
  );
  mirrorLower(out, n);
  return { rows: n, cols: n, data: out };
}

/**
 * The cross product by the WebAssembly kernel, one call per row panel and pass of periods. On the
 * kernel team's shared memory, and from MIN_SHARED_WASM_WORK, the row panels split in two shares
 * as the TypeScript kernel's do.
 */
function crossProductInWasm(x: Matrix, wasm: WasmKernels): Matrix {
  const t = x.rows;
  const n = x.cols;
  const panels = Math.ceil(n / PANEL);
  const [packed, sums] = wasm.views(panels * PANEL * t, n * n);
  packed.fill(0);
  sums.fill(0);
  packPanels(x, PANEL, packed);
  const team = wasm.shared && n * n * t >= MIN_SHARED_WASM_WORK ? kernelTeam() : null;
  const split = team ? Math.round(panels * Math.SQRT1_2) : panels;
  inTwoShares(
    team,
    { kernel: CROSS_PRODUCT_WASM_SHARE, buffers: [packed, sums], ints: [t, n, split, panels] },
    () => wasmPanels(wasm, packed, sums, t, n, 0, split),
    () => wasmPanels(wasm, packed, sums, t, n, split, panels),
  );
  const out = sums.slice();
  mirrorLower(out, n);
  return { rows: n, cols: n, data: out };
}

/** Row panels [from, to) of the lower triangle by the WebAssembly kernel, one call per panel and pass. */
function wasmPanels(
  wasm: WasmKernels,
  packed: Float64Array,
  sums: Float64Array,
  t: number,
  n: number,
  from: number,
  to: number,
): void {
  for (let k0 = 0; k0 < t; k0 += PERIODS_PER_PASS) {
    const k1 = Math.min(t, k0 + PERIODS_PER_PASS);
    for (let I = from; I < to; I++)
      wasm.exports.cross_product_row_panel(packed.byteOffset, sums.byteOffset, t, n, I, k0, k1);
  }
}

/** Whether the cross product of a T x N matrix splits over the kernel team (its threshold for the kernels that run). */
export function crossProductForks(n: number, t: number): boolean {
  const wasm = wasmKernels();
  return wasm ? wasm.shared && n * n * t >= MIN_SHARED_WASM_WORK : n * n * t >= MIN_SHARED_WORK;
}

/**
 * Below N^2 T = 2^30 (N = 920 at T = 1260) the WebAssembly product stays on one thread: it takes
 * about 60 ms there, and the first share waits 30-60 ms for the helper to load.
 */
const MIN_SHARED_WASM_WORK = 1 << 30;

/** The kernel team's name for a share of the WebAssembly cross product (see crossProductWasmShare). */
export const CROSS_PRODUCT_WASM_SHARE = 'cross-product-wasm';

/**
 * The helper's share of the WebAssembly product: buffers [packed, sums] on the team's memory, ints
 * [t, n, fromPanel, toPanel]. A helper whose module did not load makes it in TypeScript, the same sums.
 */
export function crossProductWasmShare(buffers: readonly Float64Array[], ints: readonly number[]): void {
  const wasm = helperKernels();
  if (wasm) wasmPanels(wasm, buffers[0], buffers[1], ints[0], ints[1], ints[2], ints[3]);
  else crossProductPanels(buffers[0], buffers[1], ints[0], ints[1], ints[2], ints[3]);
}

/** The kernel team's name for a share of the cross product (see crossProductShare). */
export const CROSS_PRODUCT_SHARE = 'cross-product';

/**
 * Below N^2 T = 2^29 (N = 650 at T = 1260) the product stays on one thread: in a fresh process
 * the second thread's share ran at half speed at N = 500 (its kernels not yet optimised, the
 * garbage collector's threads on the same cores), and the hand-over saved nothing.
 */
const MIN_SHARED_WORK = 1 << 29;

/** The helper's share: buffers [packed, out], ints [t, n, fromPanel, toPanel]. */
export function crossProductShare(buffers: readonly Float64Array[], ints: readonly number[]): void {
  crossProductPanels(buffers[0], buffers[1], ints[0], ints[1], ints[2], ints[3]);
}

/** The lower triangle's blocks of row panels [from, to) into `out`, periods PERIODS_PER_PASS at a time. */
function crossProductPanels(packed: Float64Array, out: Float64Array, t: number, n: number, from: number, to: number) {
  for (let k0 = 0; k0 < t; k0 += PERIODS_PER_PASS) {
    const k1 = Math.min(t, k0 + PERIODS_PER_PASS);
    for (let I = from; I < to; I++) {
      const i0 = I * PANEL;
      const iLast = Math.min(i0 + PANEL, n) - 1;
      const colPanels = Math.floor(iLast / PANEL) + 1;
      for (let J = 0; J < colPanels; J++)
        block(packed, I * t * PANEL, J * t * PANEL, k0, k1, out, n, i0, J * PANEL, iLast);
    }
  }
}

/** Rows and columns per panel of the kernel (4 x 4 blocks), and the periods per pass (the panels of one pass stay in cache). */
const PANEL = 4;
const PERIODS_PER_PASS = 512;

/** Copies the lower triangle onto the upper one. */
function mirrorLower(c: Float64Array, n: number): void {
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
  p: Float64Array,
  pa: number,
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
    const a = pa + k * PANEL;
    const b = pb + k * PANEL;
    const a0 = p[a];
    const a1 = p[a + 1];
    const a2 = p[a + 2];
    const a3 = p[a + 3];
    const b0 = p[b];
    const b1 = p[b + 1];
    const b2 = p[b + 2];
    const b3 = p[b + 3];
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

/** Every column of X as panels of `width` columns, each stored period by period, into zeroed `p`. */
function packPanels(x: Matrix, width: number, p: Float64Array): void {
  const t = x.rows;
  const n = x.cols;
  const d = x.data;
  // Row by row, so X is read in memory order.
  for (let k = 0; k < t; k++) {
    const row = k * n;
    for (let col = 0; col < n; col++) p[((col / width) | 0) * width * t + k * width + (col % width)] = d[row + col];
  }
}
