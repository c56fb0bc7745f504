import { Matrix as MlMatrix } from 'ml-matrix';
import { estimateCovariance } from '../shared-core/estimators/registry.js';
import { centred } from '../shared-core/estimators/moments.js';
import { LANCZOS_STEPS } from '../shared-core/linalg/condition.js';
import { crossProduct, crossProductNaive } from '../shared-core/linalg/cross-product.js';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { tridiagonalForm } from '../shared-core/linalg/tridiagonal-form.js';
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
 * textbook loop and ml-matrix 6.15.1's general product.
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

    figures.push(...(await reductionFigures(estimate.covariance)));
    return figures;
  },
};

/** numpy's eigvalsh (LAPACK dsytrd + dsterf through Debian's BLAS), median of `repeats` after a warm-up. */
const EIGVALSH = String.raw`
import sys, time, json
import numpy as np
a = np.fromfile(sys.argv[1], dtype="<f8").reshape(int(sys.argv[2]), -1)
np.linalg.eigvalsh(a)
times = []
for _ in range(int(sys.argv[3])):
    t0 = time.perf_counter(); v = np.linalg.eigvalsh(a); times.append((time.perf_counter() - t0) * 1000)
print(json.dumps({"ms": sorted(times)[len(times) // 2], "largest": float(v[-1])}))
`;

/**
 * The tridiagonal reduction behind the effective number of bets and the exact condition number
 * (linalg/tridiagonal-form.ts), on the shrunk N x N estimate, beside numpy's eigvalsh on the same
 * matrix, which also finds every eigenvalue from one reduction.
 */
async function reductionFigures(covariance: Matrix): Promise<BenchFigure[]> {
  const n = covariance.rows;
  const flops = (4 / 3) * n * n * n;
  const one = await timeMedian(() => tridiagonalForm(covariance), 3);
  const dir = mkdtempSync(join(tmpdir(), 'holdfast-bench-eig-'));
  const file = join(dir, 'a.f64');
  writeFileSync(file, Buffer.from(covariance.data.buffer, covariance.data.byteOffset, covariance.data.byteLength));
  const script = join(dir, 'eig.py');
  writeFileSync(script, EIGVALSH);
  const peer = spawnSync('/usr/bin/python3', [script, file, String(n), '3'], { encoding: 'utf8' });
  rmSync(dir, { recursive: true, force: true });
  const peerMs = peer.status === 0 ? (JSON.parse(peer.stdout) as { ms: number }).ms : undefined;
  const rate = (ms: number) => (flops / (ms * 1e6)).toFixed(2);
  return [
    {
      label: `tridiagonal reduction (effective bets, exact condition number) N=${n}`,
      medianMs: one,
      ...(peerMs !== undefined ? { peerMs, peerLabel: 'numpy eigvalsh (LAPACK, Debian BLAS)' } : {}),
      notes: `${rate(one)} GFLOP/s on 4/3 N^3 flops${peerMs === undefined ? '; python3 with numpy is absent: no peer' : ''}`,
    },
  ];
}
