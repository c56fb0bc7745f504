import { CROSS_PRODUCT_SHARE, crossProductShare } from '../../shared-core/linalg/cross-product.js';
import { passShare, TRIDIAGONAL_PASS_SHARE } from '../../shared-core/linalg/tridiagonal-form.js';
import { CHOLESKY_ROWS_SHARE, choleskyRowsShare } from '../../shared-core/optimise/qp/dense-factor.js';

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
  [TRIDIAGONAL_PASS_SHARE]: passShare,
  [CHOLESKY_ROWS_SHARE]: choleskyRowsShare,
};

/** The kernels' names; a job carries its kernel's index here. */
export const KERNELS: readonly string[] = Object.keys(SHARES);

/**
 * Atomic reads before a thread sleeps on a slot: a loop's next step often arrives within
 * microseconds, sooner than a sleeping thread wakes. (A millisecond's spin in the helper measured
 * no better on the N = 1500 bench's solve, 1,662 jobs at 51 us of hand-over each.)
 */
export const SPIN = 20000;

/** A small problem for each share, made up of arbitrary values, to warm the helper's kernels on. */
export const WARM_UP: Readonly<Record<string, () => [Float64Array[], number[]]>> = {
  [CROSS_PRODUCT_SHARE]: () => {
    const t = 256;
    const n = 64;
    const packed = Float64Array.from({ length: t * n }, (_, k) => Math.sin(k));
    return [
      [packed, new Float64Array(n * n)],
      [t, n, 0, n / 4],
    ];
  },
  [TRIDIAGONAL_PASS_SHARE]: () => {
    const n = 160;
    const vector = () => Float64Array.from({ length: n }, (_, k) => Math.cos(k));
    return [
      [Float64Array.from({ length: n * n }, (_, k) => Math.sin(k)), vector(), vector(), vector(), new Float64Array(n)],
      [n, n, 40],
    ];
  },
  [CHOLESKY_ROWS_SHARE]: () => {
    // Rows 64..n of columns 32..64: any values do (the share divides by the pivots it reads).
    const n = 160;
    return [[Float64Array.from({ length: n * n }, (_, k) => 1 + ((k * 7) % 13))], [n, 32, 64, 64, n]];
  },
};
