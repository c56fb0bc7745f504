/** Seeded random test problems (invented numbers, no market data). */
import { zeros, type Matrix } from '../../../shared-core/linalg/matrix.js';
import type { QpProblem, SparseRow } from '../../../shared-core/optimise/qp/index.js';
import { seededRng, type Rng } from '../../../shared-core/stability/rng.js';

export function gaussian(rng: Rng): number {
  const u = Math.max(rng.next(), 1e-300);
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rng.next());
}

/** Factor-model covariance B B' + diag(d): annualised-looking vols of 5% to 40%. */
export function randomCovariance(n: number, seed: number, factors = 3, idiosyncratic = 1, market = 0): Matrix {
  const rng = seededRng(seed);
  const B = Array.from({ length: n }, () =>
    Array.from({ length: factors }, (_, k) => 0.1 * gaussian(rng) + (k === 0 ? market * (0.5 + rng.next()) : 0)),
  );
  const d = Array.from({ length: n }, () => idiosyncratic * (0.002 + 0.03 * rng.next()));
  const S = zeros(n, n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++) {
      let v = i === j ? d[i] : 0;
      for (let k = 0; k < factors; k++) v += B[i][k] * B[j][k];
      S.data[i * n + j] = v;
    }
  return S;
}

/** A random mandate-like QP: budget, box bounds, random group bands, a linear term. */
export function randomQp(n: number, seed: number, options: { groups?: number; linear?: boolean } = {}): QpProblem {
  const rng = seededRng(seed * 7919 + 13);
  const P = randomCovariance(n, seed);
  const q = new Float64Array(n);
  if (options.linear) for (let i = 0; i < n; i++) q[i] = 0.05 * gaussian(rng);
  const A: SparseRow[] = [{ idx: [...Array(n).keys()], val: Array(n).fill(1) }];
  const b = Float64Array.of(1);
  const cap = Math.min(1, (1.5 + 2 * rng.next()) / n);
  const lb = new Float64Array(n);
  const ub = Float64Array.from({ length: n }, () => cap * (0.8 + 0.6 * rng.next()));
  const G: SparseRow[] = [];
  const h: number[] = [];
  for (let g = 0; g < (options.groups ?? 0); g++) {
    const members = [...Array(n).keys()].filter(() => rng.next() < 0.3);
    if (members.length === 0) continue;
    const maxShare = 0.2 + 0.5 * rng.next();
    G.push({ idx: members, val: members.map(() => 1) });
    h.push(maxShare);
    G.push({ idx: members, val: members.map(() => -1) });
    h.push(
      -0.5 *
        Math.min(
          maxShare,
          members.reduce((s, i) => s + ub[i], 0),
        ) *
        rng.next(),
    );
  }
  return { P, q, A, b, G, h: Float64Array.from(h), lb, ub };
}
