import { Matrix as MlMatrix } from 'ml-matrix';
import { estimateCovariance } from '../shared-core/estimators/registry.js';
import { centred } from '../shared-core/estimators/moments.js';
import { LANCZOS_STEPS } from '../shared-core/linalg/condition.js';
import { crossProduct, crossProductNaive } from '../shared-core/linalg/cross-product.js';
import { twoThreadCrossProduct } from '../src-main/compute/two-thread-cross-product.js';
import { zeros, type Matrix } from '../shared-core/linalg/matrix.js';
import { timeMedian, type BenchFigure, type BenchSuite } from './harness.js';

const N = 1500;
const T = 1260;

/** Seeded one-factor daily returns with idiosyncratic noise (invented data). */
function syntheticReturns(t: number, n: number): Matrix {
  let s = 20240615;
  const next = () => {
    s = (s * 48271) % 2147483647;
    return s / 2147483647 - 0.5;
  };
  const beta = Float64Array.from({ length: n }, () => 1 + next());
  const x = zeros(t, n);
  for (let k = 0; k < t; k++) {
    const f = 0.03 * next();
    for (let i = 0; i < n; i++) x.data[k * n + i] = 0.0002 + beta[i] * f + 0.02 * next();
  }
  return x;
}

const gflops = (madds: number, ms: number) => ((2 * madds) / (ms * 1e6)).toFixed(2);

/**
 * `ledoit-wolf` at N = 1500 assets, T = 1260 daily returns (target 1.0 s in-process, estimators
 * issue), and the cross product X'X that dominates it: the register-blocked kernel beside the
 * textbook loop, ml-matrix 6.15.1's general product and the same kernel on two threads.
 */
export const estimatorsSuite: BenchSuite = {
  name: 'estimators',
  async run() {
    const returns = syntheticReturns(T, N);
    const crossMadds = ((N * (N + 1)) / 2) * T;
    // Lanczos condition number: one N x N product per step plus two reorthogonalisation passes.
    const lanczosMadds = LANCZOS_STEPS * N * N + LANCZOS_STEPS * LANCZOS_STEPS * N * 2;
    const lwMadds = crossMadds + lanczosMadds + 4 * N * T + 3 * N * N;
    const figures: BenchFigure[] = [];

    const lw = await timeMedian(
      () => estimateCovariance(returns, { method: 'ledoit-wolf' }, { frequency: 'daily' }),
      5,
    );
    const estimate = estimateCovariance(returns, { method: 'ledoit-wolf' }, { frequency: 'daily' });
    figures.push({
      label: `ledoit-wolf scaled-identity N=${N} T=${T} (with diagnostics)`,
      medianMs: lw,
      targetMs: 1000,
      notes:
        `${(lwMadds / 1e9).toFixed(3)} G multiply-adds (X'X ${(crossMadds / 1e9).toFixed(3)} G, Lanczos ${(lanczosMadds / 1e9).toFixed(3)} G), ` +
        `${gflops(lwMadds, lw)} GFLOP/s; shrinkage ${estimate.diagnostics.shrinkage?.toFixed(4)}; ` +
        'N x N buffers alive at once: 1 (S, shrunk in place) + 0 in the Lanczos diagnostic',
    });

    const x = centred(returns);
    const kernel = await timeMedian(() => crossProduct(x), 5);
    const naive = await timeMedian(() => crossProductNaive(x), 1);
    figures.push({
      label: `X'X kernel (4 x 4 register blocks) N=${N} T=${T}`,
      medianMs: kernel,
      peerMs: naive,
      peerLabel: 'textbook loop',
      notes: `${(crossMadds / 1e9).toFixed(3)} G multiply-adds; kernel ${gflops(crossMadds, kernel)} GFLOP/s, loop ${gflops(crossMadds, naive)} GFLOP/s`,
    });

    const ml = new MlMatrix(T, N);
    for (let k = 0; k < T; k++) ml.setRow(k, Array.from(x.data.subarray(k * N, (k + 1) * N)));
    const mlMs = await timeMedian(() => ml.transpose().mmul(ml), 1);
    figures.push({
      label: `X'X kernel N=${N} T=${T} against ml-matrix 6.15.1 transpose().mmul() (full N^2 T product)`,
      medianMs: kernel,
      peerMs: mlMs,
      peerLabel: 'ml-matrix',
      notes: `ml-matrix ${gflops(N * N * T, mlMs)} GFLOP/s on its ${((N * N * T) / 1e9).toFixed(3)} G multiply-adds`,
    });

    // The edge's two-thread X'X, as holdfast estimate and holdfast solve run it.
    twoThreadCrossProduct(x); // starts the worker thread once, outside the timing
    const threaded = await timeMedian(() => twoThreadCrossProduct(x), 5);
    const check = twoThreadCrossProduct(x).data;
    const single = crossProduct(x).data;
    let diff = 0;
    for (let k = 0; k < check.length; k++) diff = Math.max(diff, Math.abs(check[k] - single[k]));
    figures.push({
      label: `X'X kernel on two threads (src-main/compute, the command line's) N=${N} T=${T}`,
      medianMs: threaded,
      peerMs: kernel,
      peerLabel: 'one thread',
      notes: `${gflops(crossMadds, threaded)} GFLOP/s; max difference from one thread ${diff.toExponential(1)}; the 2 cores are shared with every other process`,
    });
    const lwTwo = await timeMedian(
      () =>
        estimateCovariance(
          returns,
          { method: 'ledoit-wolf' },
          { frequency: 'daily', crossProduct: twoThreadCrossProduct },
        ),
      5,
    );
    figures.push({
      label: `ledoit-wolf scaled-identity N=${N} T=${T} with the two-thread X'X (as holdfast estimate runs it)`,
      medianMs: lwTwo,
      targetMs: 1000,
      peerMs: lw,
      peerLabel: 'one thread',
      notes: `${gflops(lwMadds, lwTwo)} GFLOP/s`,
    });
    return figures;
  },
};
