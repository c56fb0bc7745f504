/** Small helpers for the optimiser tests. */
import { fromRows, type Matrix } from '../../../shared-core/linalg/matrix.js';
import type { ObjectiveSpec } from '../../../shared-core/scenario/objective-spec.js';
import type { Constraints } from '../../../shared-core/scenario/schema.js';
import { solveCandidate, type CandidateProblem } from '../../../shared-core/optimise/solve-candidate.js';
import type { CandidateResult, OptimalCandidate, SolvedCandidate } from '../../../shared-core/optimise/result.js';
import { optimal } from '../../support/candidate-status.js';

export const ids = (n: number): string[] => Array.from({ length: n }, (_, i) => `A${String(i + 1).padStart(3, '0')}`);

/** Whatever the solve gives: for the tests of infeasible and failed problems. */
export function attempt(
  covariance: Matrix,
  objective: ObjectiveSpec,
  constraints: Constraints = {},
  extra: Partial<CandidateProblem> = {},
): CandidateResult {
  return solveCandidate({ id: 't', assets: ids(covariance.rows), covariance, objective, constraints, ...extra });
}

/** The optimum; a problem that does not solve fails the test with its status and message. */
export function solve(...args: Parameters<typeof attempt>): OptimalCandidate {
  return optimal(attempt(...args));
}

export const weightsArray = (r: SolvedCandidate, n: number): number[] => ids(n).map((a) => r.weights[a]);

export function equicorrelated(n: number, vol: number, rho: number): Matrix {
  return fromRows(
    Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => vol * vol * (i === j ? 1 : rho))),
  );
}

/** Solves A x = b for a small dense matrix by Gaussian elimination (test-side reference). */
export function solveLinear(A: number[][], b: number[]): number[] {
  const n = b.length;
  const M = A.map((r, i) => [...r, b[i]]);
  for (let k = 0; k < n; k++) {
    let p = k;
    for (let i = k + 1; i < n; i++) if (Math.abs(M[i][k]) > Math.abs(M[p][k])) p = i;
    [M[k], M[p]] = [M[p], M[k]];
    for (let i = k + 1; i < n; i++) {
      const f = M[i][k] / M[k][k];
      for (let j = k; j <= n; j++) M[i][j] -= f * M[k][j];
    }
  }
  const x = new Array<number>(n).fill(0);
  for (let i = n - 1; i >= 0; i--) {
    let s = M[i][n];
    for (let j = i + 1; j < n; j++) s -= M[i][j] * x[j];
    x[i] = s / M[i][i];
  }
  return x;
}
