import {
  CROSS_PRODUCT_SHARE,
  CROSS_PRODUCT_WASM_SHARE,
  crossProductShare,
  crossProductWasmShare,
} from '../../shared-core/linalg/cross-product.js';
import {
  passShare,
  TRIDIAGONAL_PASS_SHARE,
  TRIDIAGONAL_WASM_PASS_SHARE,
  wasmPassShare,
} from '../../shared-core/linalg/tridiagonal-form.js';
import {
  CHOLESKY_ROWS_SHARE,
  CHOLESKY_ROWS_WASM_SHARE,
  choleskyRowsShare,
  choleskyRowsWasmShare,
} from '../../shared-core/optimise/qp/dense-factor.js';

/**
 * The control block shared by the command line's thread and its kernel helper (kernel-team.ts,
 * kernel-worker.ts): one Int32Array, these slots.
 */
export const CONTROL = {
  /** The helper has loaded its kernels (1). */
  ready: 0,
  /** The helper thread stopped (1): fork refuses, join throws. */
  gone: 1,
  /** Sequence number of the latest job; the helper waits on it. */
  job: 2,
  /** Sequence number of the latest job finished; the caller waits on it. */
  done: 3,
  /** Sequence number of the latest job whose share threw. */
  failed: 4,
  /** The job's sequence number when its buffers were posted with it, else 0. */
  bind: 5,
  /** Index of the job's kernel in KERNELS. */
  kernel: 6,
  /** First of the job's integers. */
  ints: 8,
  size: 24,
} as const;

/** Integers a job may carry. */
export const INTS_MAX = CONTROL.size - CONTROL.ints;

/** A share the helper makes: the job's buffers and integers, as the kernel's own share function takes them. */
export type Share = (buffers: readonly Float64Array[], ints: readonly number[]) => void;

/** The shares the helper can make, by the names the kernels give them. */
export const SHARES: Readonly<Record<string, Share>> = {
  [CROSS_PRODUCT_SHARE]: crossProductShare,
  [CROSS_PRODUCT_WASM_SHARE]: crossProductWasmShare,
  [TRIDIAGONAL_PASS_SHARE]: passShare,
  [TRIDIAGONAL_WASM_PASS_SHARE]: wasmPassShare,
  [CHOLESKY_ROWS_SHARE]: choleskyRowsShare,
  [CHOLESKY_ROWS_WASM_SHARE]: choleskyRowsWasmShare,
};

/** The kernels' names; a job carries its kernel's index here. */
export const KERNELS: readonly string[] = Object.keys(SHARES);

/**
 * Atomic reads before a thread sleeps on a slot: a loop's next step often arrives within
 * microseconds, sooner than a sleeping thread wakes. (A millisecond's spin in the helper measured
 * no better on the N = 1500 bench's solve, 1,662 jobs at 51 us of hand-over each.)
 */
export const SPIN = 20000;
