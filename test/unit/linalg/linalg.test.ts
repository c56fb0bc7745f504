import { describe, expect, it } from 'vitest';
import { cholesky, inverseQuadraticForm } from '../../../shared-core/linalg/cholesky.js';
import { conditionNumber, lanczosRitzValues } from '../../../shared-core/linalg/condition.js';
import { crossProduct, crossProductNaive } from '../../../shared-core/linalg/cross-product.js';
import { fromRows, zeros, type Matrix } from '../../../shared-core/linalg/matrix.js';
import {
  formEigenvalues,
  formExtremes,
  spectralExposures,
  symmetricEigen,
  symmetricEigenvalues,
  tridiagonalEigenvalues,
} from '../../../shared-core/linalg/symmetric-eigen.js';
import { intoTridiagonalBasis, tridiagonalForm } from '../../../shared-core/linalg/tridiagonal-form.js';
import { loadFixture, matrix, relativeError } from '../estimators/fixtures.js';

/** A seeded linear congruential stream in (-0.5, 0.5) (Park and Miller 1988 multiplier). */
function stream(seed: number): () => number {
  let s = seed;
  return () => {
    s = (s * 16807) % 2147483647;
    return s / 2147483647 - 0.5;
  };
}

function randomMatrix(rows: number, cols: number, seed: number): Matrix {
  const next = stream(seed);
  const m = zeros(rows, cols);
  for (let k = 0; k < m.data.length; k++) m.data[k] = next();
  return m;
}

describe("cross product X'X (the O(N^2 T) step of every estimator)", () => {
  it.each([
    [1, 1],
    [7, 5],
    [13, 11],
    [50, 37],
    [1100, 10], // more periods than one pass of 512
  ])(
    'the register-blocked kernel equals the textbook loop for T=%i, N=%i (sizes not multiples of the 4 x 4 block)',
    (t, n) => {
      const x = randomMatrix(t, n, t * 31 + n);
      expect(relativeError(crossProduct(x).data, crossProductNaive(x).data)).toBeLessThan(1e-14);
    },
  );
});

describe('symmetric eigen-decomposition (tred2/tql2)', () => {
  it('eigenvalues of the sample covariance of EuStockMarkets and of the N > T data set match numpy.linalg.eigvalsh', () => {
    for (const name of ['eustock', 'wide', 'mid']) {
      const f = loadFixture(name);
      const values = symmetricEigenvalues(matrix(f.sample.covariance));
      expect(relativeError(values, f.sample.eigenvalues)).toBeLessThan(1e-12);
      expect(relativeError(symmetricEigen(matrix(f.sample.covariance)).values, f.sample.eigenvalues)).toBeLessThan(
        1e-12,
      );
    }
  });

  it('A V = V Lambda with orthonormal V, eigenvalues ascending', () => {
    const x = randomMatrix(40, 25, 9);
    const a = crossProduct(x);
    const { values, vectors } = symmetricEigen(a);
    const n = 25;
    for (let k = 1; k < n; k++) expect(values[k]).toBeGreaterThanOrEqual(values[k - 1]);
    let residual = 0;
    let orthogonality = 0;
    for (let k = 0; k < n; k++)
      for (let i = 0; i < n; i++) {
        let av = 0;
        for (let j = 0; j < n; j++) av += a.data[i * n + j] * vectors.data[j * n + k];
        residual = Math.max(residual, Math.abs(av - values[k] * vectors.data[i * n + k]));
        for (let l = 0; l < n; l++) {
          if (i > 0) break;
          let dot = 0;
          for (let j = 0; j < n; j++) dot += vectors.data[j * n + k] * vectors.data[j * n + l];
          orthogonality = Math.max(orthogonality, Math.abs(dot - (k === l ? 1 : 0)));
        }
      }
    expect(residual).toBeLessThan(1e-12 * values[n - 1]);
    expect(orthogonality).toBeLessThan(1e-13);
  });

  it("exposures (e_k'v)^2 to the eigenvectors, found without forming them, equal those from the full decomposition", () => {
    for (const [rows, n, seed] of [
      [60, 30, 3],
      [20, 35, 4], // rank-deficient: the null eigenvalue repeats
      [300, 1, 5],
    ] as const) {
      const a = crossProduct(randomMatrix(rows, n, seed));
      const v = Array.from({ length: n }, stream(seed + 100));
      const full = symmetricEigen(a);
      const { values, exposures } = spectralExposures(a, v);
      const order = Array.from(values, (_, k) => k).sort((i, j) => values[i] - values[j]);
      expect(
        relativeError(
          Float64Array.from(order, (k) => values[k]),
          full.values,
        ),
      ).toBeLessThan(1e-12);
      let total = 0;
      for (const x of exposures) total += x;
      expect(total).toBeCloseTo(
        v.reduce((s, x) => s + x * x, 0),
        12,
      );
      // Distinct eigenvalues: one exposure each, as from the eigenvectors.
      const scale = full.values[n - 1];
      for (let k = 0; k < n; k++) {
        const sorted = order[k];
        if (k > 0 && full.values[k] - full.values[k - 1] < 1e-8 * scale) continue;
        if (k < n - 1 && full.values[k + 1] - full.values[k] < 1e-8 * scale) continue;
        let e = 0;
        for (let i = 0; i < n; i++) e += full.vectors.data[i * n + k] * v[i];
        expect(exposures[sorted]).toBeCloseTo(e * e, 10);
      }
    }
  });

  it('a tridiagonal matrix with 2 on the diagonal and -1 beside it has eigenvalues 2 - 2 cos(k pi / (n + 1)) (a textbook closed form)', () => {
    const n = 12;
    const values = tridiagonalEigenvalues(new Array(n).fill(2), new Array(n - 1).fill(-1));
    const exact = Array.from({ length: n }, (_, k) => 2 - 2 * Math.cos(((k + 1) * Math.PI) / (n + 1)));
    expect(relativeError(values, exact)).toBeLessThan(1e-14);
  });
});

describe('condition number and Lanczos', () => {
  it('Ritz values lie inside the spectrum and the extreme ones converge to the extreme eigenvalues', () => {
    const a = crossProduct(randomMatrix(300, 120, 3));
    const exact = symmetricEigenvalues(a);
    const ritz = lanczosRitzValues(a, 60);
    expect(ritz[0]).toBeGreaterThanOrEqual(exact[0] * (1 - 1e-12));
    expect(ritz[ritz.length - 1]).toBeLessThanOrEqual(exact[exact.length - 1] * (1 + 1e-12));
    expect(Math.abs(ritz[ritz.length - 1] / exact[exact.length - 1] - 1)).toBeLessThan(1e-8);
    const full = lanczosRitzValues(a, 120);
    expect(relativeError(full, exact)).toBeLessThan(1e-9);
  });

  it('above the exact limit the condition number uses Lanczos: the largest eigenvalue converged, the ratio a lower bound', () => {
    const x = randomMatrix(700, 650, 21);
    for (let k = 0; k < 700; k++) for (let i = 0; i < 650; i++) x.data[k * 650 + i] += 0.3 * x.data[k * 650]; // one strong factor
    const a = crossProduct(x);
    const exact = symmetricEigenvalues(a);
    const c = conditionNumber(a);
    expect(c.method).toBe('lanczos');
    expect(Math.abs(c.largest / exact[649] - 1)).toBeLessThan(1e-10);
    expect(c.value).toBeLessThanOrEqual((exact[649] / exact[0]) * (1 + 1e-12));
    const known = conditionNumber(a, exact[0]);
    expect(known.method).toBe('lanczos-largest');
    expect(Math.abs(known.value / (exact[649] / exact[0]) - 1)).toBeLessThan(1e-10);
  });

  it('a singular matrix has an infinite condition number; diag(1, 4) has 4', () => {
    expect(
      conditionNumber(
        fromRows([
          [1, 1],
          [1, 1],
        ]),
      ).value,
    ).toBe(Infinity);
    expect(
      conditionNumber(
        fromRows([
          [1, 0],
          [0, 4],
        ]),
      ).value,
    ).toBeCloseTo(4, 14);
  });
});

describe('Cholesky', () => {
  it("L L' = A and z'A^-1 z by forward substitution; not positive definite gives undefined", () => {
    const a = fromRows([
      [4, 2, 0.4],
      [2, 5, 1],
      [0.4, 1, 3],
    ]);
    const l = cholesky(a)!;
    for (let i = 0; i < 3; i++)
      for (let j = 0; j < 3; j++) {
        let s = 0;
        for (let k = 0; k < 3; k++) s += l.data[i * 3 + k] * l.data[j * 3 + k];
        expect(s).toBeCloseTo(a.data[i * 3 + j], 14);
      }
    // A^-1 z for z = A (1, 1, 1)' is (1, 1, 1)', so z'A^-1 z = sum of A's entries.
    const z = [6.4, 8, 4.4];
    expect(inverseQuadraticForm(l, z, new Float64Array(3))).toBeCloseTo(18.8, 12);
    expect(
      cholesky(
        fromRows([
          [1, 2],
          [2, 1],
        ]),
      ),
    ).toBeUndefined();
  });
});

describe("tridiagonal form A = Q T Q' (one Householder reduction shared by every spectral question)", () => {
  /** Q'AQ from the stored reflectors, against the tridiagonal T the reduction reports. */
  function similarityError(a: Matrix): number {
    const n = a.rows;
    const form = tridiagonalForm(a);
    const qt = Array.from({ length: n }, (_, k) => {
      const unit = new Float64Array(n);
      unit[k] = 1;
      return intoTridiagonalBasis(form, unit); // column k of Q'
    });
    let worst = 0;
    let size = 0;
    for (const x of a.data) size = Math.max(size, Math.abs(x));
    for (let r = 0; r < n; r++)
      for (let c = 0; c < n; c++) {
        let s = 0;
        for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) s += qt[i][r] * a.data[i * n + j] * qt[j][c];
        const t = r === c ? form.diagonal[r] : Math.abs(r - c) === 1 ? form.offDiagonal[Math.max(r, c)] : 0;
        worst = Math.max(worst, Math.abs(s - t));
      }
    return worst / size;
  }

  it('the reflectors carry A into the reported tridiagonal T (an orthogonal similarity, Golub and Van Loan 2013, section 8.3.1)', () => {
    expect(similarityError(crossProduct(randomMatrix(40, 17, 8)))).toBeLessThan(1e-14);
    // Rank-deficient, and with rows that are already reduced (nothing to reflect at some steps).
    const a = crossProduct(randomMatrix(5, 12, 9));
    for (let j = 0; j < 12; j++) if (j !== 11) a.data[11 * 12 + j] = a.data[j * 12 + 11] = 0;
    expect(similarityError(a)).toBeLessThan(1e-14);
    const diagonal = zeros(6, 6);
    for (let i = 0; i < 6; i++) diagonal.data[i * 7] = i + 1;
    expect(similarityError(diagonal)).toBe(0);
  });

  it("a repeated eigenvalue takes the whole exposure of its eigenspace, which does not depend on the basis numpy's eigh happens to pick", () => {
    const n = 30;
    const a = crossProduct(randomMatrix(12, n, 11)); // the zero eigenvalue repeats 18 times
    const v = Array.from({ length: n }, stream(12));
    const full = symmetricEigen(a);
    let null2 = 0;
    for (let k = 0; k < n - 12; k++) {
      let e = 0;
      for (let i = 0; i < n; i++) e += full.vectors.data[i * n + k] * v[i];
      null2 += e * e;
    }
    const { values, exposures } = spectralExposures(a, v);
    const small = Array.from(values, (x, k) => [x, exposures[k]]).filter(
      ([x]) => Math.abs(x) < 1e-9 * full.values[n - 1],
    );
    expect(small).toHaveLength(n - 12);
    expect(small.filter(([, e]) => e > 0)).toHaveLength(1);
    expect(small.reduce((s, [, e]) => s + e, 0)).toBeCloseTo(null2, 12);
    // The identity: one eigenvalue, one bet whatever the vector.
    const identity = zeros(5, 5);
    for (let i = 0; i < 5; i++) identity.data[i * 6] = 1;
    expect(spectralExposures(identity, [0.1, 0.2, 0.3, 0.2, 0.2]).exposures.filter((e) => e > 0)).toHaveLength(1);
  });

  it('bisection on Sturm counts finds the extreme eigenvalues that QL finds (Barth, Martin and Wilkinson 1967)', () => {
    for (const [rows, n, seed] of [
      [60, 30, 21],
      [20, 35, 22], // rank-deficient: the smallest is zero up to rounding
      [500, 3, 23],
      [1, 1, 24],
    ] as const) {
      const form = tridiagonalForm(crossProduct(randomMatrix(rows, n, seed)));
      const all = formEigenvalues(form);
      const { smallest, largest } = formExtremes(form);
      const size = Math.abs(all[n - 1]);
      expect(Math.abs(largest - all[n - 1])).toBeLessThan(8 * 2 ** -52 * size * n);
      expect(Math.abs(smallest - all[0])).toBeLessThan(8 * 2 ** -52 * size * n);
    }
    // Any scale: the count works on T / (its Gershgorin bound), so no square overflows or underflows.
    // [[2,1,0],[1,2,1],[0,1,2]] has eigenvalues 2 - sqrt(2), 2, 2 + sqrt(2) (a textbook closed form).
    for (const scale of [1e-165, 1e-160, 1, 1e155, 1e300]) {
      const m = fromRows([
        [2, 1, 0],
        [1, 2, 1],
        [0, 1, 2],
      ]);
      for (let k = 0; k < 9; k++) m.data[k] *= scale;
      const { smallest, largest } = formExtremes(tridiagonalForm(m));
      expect(smallest / scale).toBeCloseTo(2 - Math.SQRT2, 12);
      expect(largest / scale).toBeCloseTo(2 + Math.SQRT2, 12);
    }
  });
});
