import { fileURLToPath } from 'node:url';
import { afterEach, describe, expect, it } from 'vitest';
import { kernelSourceDigest } from '../../../scripts/kernel-source-digest.mjs';
import {
  crossProduct,
  crossProductNaive,
  crossProductShare,
  crossProductWasmShare,
} from '../../../shared-core/linalg/cross-product.js';
import type { Matrix } from '../../../shared-core/linalg/matrix.js';
import { formEigenvalues, formExposures, tridiagonalEigenvalues } from '../../../shared-core/linalg/symmetric-eigen.js';
import {
  passShare,
  tridiagonalForm,
  wasmPassShare,
  type TridiagonalForm,
} from '../../../shared-core/linalg/tridiagonal-form.js';
import { KERNEL_SOURCE_DIGEST } from '../../../shared-core/linalg/wasm/kernel-binary.js';
import {
  backSubstituteTransposed,
  choleskyInPlace,
  choleskySolveInPlace,
  forwardSubstitute,
} from '../../../shared-core/optimise/qp/dense-factor.js';
import { helperKernels, useWasmKernels, wasmKernels } from '../../../shared-core/linalg/wasm/wasm-kernels.js';
import { choleskyRowsShare, choleskyRowsWasmShare } from '../../../shared-core/optimise/qp/dense-factor.js';
import { randomMatrix, sameBits } from '../../support/random-matrix.js';

/**
 * The dense kernels in WebAssembly SIMD (shared-core/linalg/wasm/). The specification: each makes
 * the same answer, bit for bit, as its TypeScript twin, which runs wherever the module cannot; and
 * the embedded module is the one its C sources compile to.
 */

/** `f` with the WebAssembly kernels and then without them. */
function bothWays<T>(f: () => T): { wasm: T; typescript: T } {
  useWasmKernels(true);
  const wasm = f();
  useWasmKernels(false);
  try {
    return { wasm, typescript: f() };
  } finally {
    useWasmKernels(true);
  }
}

afterEach(() => useWasmKernels(true));

/** A symmetric positive definite n x n matrix: X'X of a random (n + 20) x n X, plus 1e-3 I. */
function positiveDefinite(n: number, seed: number): Float64Array {
  const a = crossProduct(randomMatrix(n + 20, n, seed)).data;
  for (let i = 0; i < n; i++) a[i * n + i] += 1e-3;
  return a;
}

/** The factor of a copy of `a` both ways: whether it factored, and the array as each left it. */
function factorBothWays(a: Float64Array, n: number) {
  return bothWays(() => {
    const f = Float64Array.from(a);
    return { factored: choleskyInPlace(f, n), f };
  });
}

describe('the WebAssembly kernels', () => {
  it('were compiled from the C sources as they are now (npm run build:wasm after a change)', () => {
    const folder = fileURLToPath(new URL('../../../shared-core/linalg/wasm/', import.meta.url));
    expect(KERNEL_SOURCE_DIGEST).toBe(kernelSourceDigest(folder));
  });

  it('run on Node 20, which has WebAssembly SIMD, and are off when switched off', () => {
    expect(wasmKernels()).not.toBeNull();
    useWasmKernels(false);
    expect(wasmKernels()).toBeNull();
  });

  it.each([
    [1, 1],
    [3, 5],
    [513, 7],
    [1100, 130],
    [1030, 261],
    [2, 400],
  ])("make X'X bit for bit as the TypeScript kernel does (T = %i, N = %i)", (t, n) => {
    const x = randomMatrix(t, n, t * 7 + n);
    const { wasm, typescript } = bothWays(() => crossProduct(x).data);
    expect(sameBits(wasm, typescript)).toBe(true);
    // And both are X'X: the textbook triple loop, to rounding.
    const naive = crossProductNaive(x).data;
    let scale = 0;
    let error = 0;
    naive.forEach((v, k) => {
      scale = Math.max(scale, Math.abs(v));
      error = Math.max(error, Math.abs(wasm[k] - v));
    });
    expect(error).toBeLessThanOrEqual(1e-14 * scale * Math.sqrt(t));
  });

  it('reuse their memory from one call to the next without carrying values over', () => {
    const big = crossProduct(randomMatrix(600, 90, 1)).data;
    const small = randomMatrix(40, 9, 2);
    const { wasm, typescript } = bothWays(() => crossProduct(small).data);
    expect(big.length).toBe(8100);
    expect(sameBits(wasm, typescript)).toBe(true);
  });

  /** A symmetric N x N matrix: X'X of a T x N matrix (rank min(T, N)), both triangles filled. */
  function symmetric(t: number, n: number, seed: number): Matrix {
    const x = randomMatrix(t, n, seed);
    return crossProductNaive(x);
  }

  /** Every array of a reduction, bit for bit. */
  const sameForm = (a: TridiagonalForm, b: TridiagonalForm) =>
    a.n === b.n &&
    sameBits(a.diagonal, b.diagonal) &&
    sameBits(a.offDiagonal, b.offDiagonal) &&
    sameBits(a.reflectors, b.reflectors) &&
    sameBits(a.halfNorms, b.halfNorms);

  it.each([1, 2, 3, 5, 31, 33, 64, 65, 200, 513, 600])(
    'reduce a symmetric matrix to tridiagonal form bit for bit as the TypeScript does (N = %i)',
    (n) => {
      const a = symmetric(n + 7, n, n * 13 + 1);
      const { wasm, typescript } = bothWays(() => tridiagonalForm(a));
      expect(sameForm(wasm, typescript)).toBe(true);
      // Not trivially: the reduction really ran (T's entries are not the input's).
      if (n >= 3) expect(wasm.offDiagonal.some((x, k) => k > 0 && x !== 0)).toBe(true);
    },
  );

  it('reduce bit for bit where columns are zero, the rank is low or parts are already tridiagonal', () => {
    const cases: Matrix[] = [];
    // Rank 4 of 65: most steps have little left to reflect.
    cases.push(symmetric(4, 65, 3));
    // Zero rows and columns scattered through, including the last and the first.
    const holes = symmetric(90, 70, 4);
    for (const z of [0, 5, 6, 33, 68, 69])
      for (let k = 0; k < 70; k++) holes.data[z * 70 + k] = holes.data[k * 70 + z] = 0;
    cases.push(holes);
    // Already tridiagonal in its trailing 40 rows (and diagonal at the very end): steps with nothing to reduce.
    const part = symmetric(80, 64, 5);
    for (let i = 24; i < 64; i++) for (let j = 0; j < i - 1; j++) part.data[i * 64 + j] = part.data[j * 64 + i] = 0;
    for (let i = 60; i < 64; i++) part.data[i * 64 + i - 1] = part.data[(i - 1) * 64 + i] = 0;
    cases.push(part);
    // Fully tridiagonal, and diagonal.
    const tri = { rows: 33, cols: 33, data: new Float64Array(33 * 33) };
    for (let i = 0; i < 33; i++) {
      tri.data[i * 34] = 2 + i / 7;
      if (i > 0) tri.data[i * 33 + i - 1] = tri.data[(i - 1) * 33 + i] = -1 + i / 50;
    }
    cases.push(tri);
    const diagonal = { rows: 31, cols: 31, data: new Float64Array(31 * 31) };
    for (let i = 0; i < 31; i++) diagonal.data[i * 32] = i - 15;
    cases.push(diagonal);
    for (const a of cases) {
      const { wasm, typescript } = bothWays(() => tridiagonalForm(a));
      expect(sameForm(wasm, typescript)).toBe(true);
    }
  });

  it('reduce a small matrix after a large one without carrying its values over', () => {
    tridiagonalForm(symmetric(300, 200, 6));
    const small = symmetric(50, 40, 7);
    const { wasm, typescript } = bothWays(() => tridiagonalForm(small));
    expect(sameForm(wasm, typescript)).toBe(true);
  });

  // Below order 32 (one block) the factor stays in TypeScript on both paths: those orders check
  // that the switch between them keeps the answer.
  it.each([1, 2, 3, 5, 31, 32, 33, 64, 65, 200, 501])(
    "factor A = L L' bit for bit as the TypeScript kernel does (n = %i)",
    (n) => {
      const a = positiveDefinite(n, 17 * n + 3);
      const { wasm, typescript } = factorBothWays(a, n);
      expect(wasm.factored).toBe(true);
      expect(typescript.factored).toBe(true);
      expect(sameBits(wasm.f, typescript.f)).toBe(true);
      // And L is a Cholesky factor: (L L')_ij = A_ij on the lower triangle, to rounding (the
      // definition; Golub and Van Loan, Matrix Computations, 4.2), and its diagonal positive.
      const l = wasm.f;
      let scale = 0;
      let error = 0;
      for (let i = 0; i < n; i++) {
        expect(l[i * n + i]).toBeGreaterThan(0);
        for (let j = 0; j <= i; j++) {
          let s = 0;
          for (let k = 0; k <= j; k++) s += l[i * n + k] * l[j * n + k];
          scale = Math.max(scale, Math.abs(a[i * n + j]));
          error = Math.max(error, Math.abs(s - a[i * n + j]));
        }
      }
      expect(error).toBeLessThanOrEqual(1e-13 * scale * n);
    },
  );

  it.each([
    [1, 0],
    [2, 1],
    [5, 4],
    [33, 32],
    [64, 10],
    [65, 64],
    [200, 71],
    [200, 199],
    [501, 300],
  ])('refuse a matrix that is not positive definite where the TypeScript does (n = %i, column %i)', (n, bad) => {
    const a = positiveDefinite(n, 5 * n + bad);
    // Row and column `bad` made those of an earlier one (or zero) but for a smaller diagonal
    // entry: its pivot, the diagonal less what the earlier one's took, is negative.
    const like = bad === 0 ? -1 : bad - 1;
    for (let k = 0; k < n; k++) {
      const v = like < 0 ? 0 : a[like * n + k];
      a[bad * n + k] = v;
      a[k * n + bad] = v;
    }
    a[bad * n + bad] = like < 0 ? -1 : 0.5 * a[like * n + like];
    const { wasm, typescript } = factorBothWays(a, n);
    expect(wasm.factored).toBe(false);
    expect(typescript.factored).toBe(false);
    // The same columns factored before the refusal, and the rest left alone.
    expect(sameBits(wasm.f, typescript.f)).toBe(true);
    if (like >= 0) expect(wasm.f[like * n + like]).toBeGreaterThan(0);
    expect(Object.is(wasm.f[(n - 1) * n + n - 1], a[(n - 1) * n + n - 1]) || bad === n - 1).toBe(true);
  });

  it('refuse a matrix with a NaN or an infinite entry where the TypeScript does', () => {
    for (const [n, i, j, v] of [
      [40, 37, 3, Number.NaN],
      [70, 66, 66, Number.POSITIVE_INFINITY],
      [70, 2, 1, Number.NaN],
    ]) {
      const a = positiveDefinite(n, n + i);
      a[i * n + j] = v;
      a[j * n + i] = v;
      const { wasm, typescript } = factorBothWays(a, n);
      expect(wasm.factored).toBe(false);
      expect(typescript.factored).toBe(false);
      expect(sameBits(wasm.f, typescript.f)).toBe(true);
    }
  });

  /** A right-hand side of order n with `zeros` leading zeros (a sparse one, as a constraint row). */
  function rightHandSide(n: number, zeros: number, seed: number): Float64Array {
    const b = Float64Array.from(randomMatrix(1, n, seed).data);
    b.fill(0, 0, zeros);
    return b;
  }

  /** L of a positive definite matrix of order n, factored by the path switched on. */
  function factorOf(n: number, seed: number): Float64Array {
    const l = positiveDefinite(n, seed);
    expect(choleskyInPlace(l, n)).toBe(true);
    return l;
  }

  it.each([
    [32, 0],
    [33, 5],
    [64, 63],
    [40, 0],
    [41, 7],
    [47, 3],
    [48, 47],
    [65, 0],
    [127, 9],
    [128, 0],
    [129, 100],
    [200, 17],
    [501, 250],
  ])(
    "solve L y = b, L' x = y and L L' x = b bit for bit as the TypeScript does (n = %i, %i leading zeros)",
    (n, zeros) => {
      const b = rightHandSide(n, zeros, n + zeros);
      const { wasm, typescript } = bothWays(() => {
        const l = factorOf(n, 3 * n);
        const forward = Float64Array.from(b);
        forwardSubstitute(l, n, forward);
        const back = Float64Array.from(forward);
        backSubstituteTransposed(l, n, back);
        const both = Float64Array.from(b);
        choleskySolveInPlace(l, n, both);
        return { forward, back, both };
      });
      expect(sameBits(wasm.forward, typescript.forward)).toBe(true);
      expect(sameBits(wasm.back, typescript.back)).toBe(true);
      expect(sameBits(wasm.both, typescript.both)).toBe(true);
      expect(sameBits(wasm.both, wasm.back)).toBe(true);
      // And x solves A x = b: the residual is at rounding's scale.
      const a = positiveDefinite(n, 3 * n);
      let worst = 0;
      for (let i = 0; i < n; i++) {
        let s = -b[i];
        for (let k = 0; k < n; k++) s += a[i * n + k] * wasm.both[k];
        worst = Math.max(worst, Math.abs(s));
      }
      expect(worst).toBeLessThan(1e-9);
    },
  );

  /**
   * L' x = y by the back-substitution kernel itself, called on rows `rowsPerCall` at a time from
   * the last row up (the solve's driver calls 64): it runs at any order, where the solves below
   * order 32 stay in TypeScript.
   */
  function backByKernel(l: Float64Array, n: number, y: Float64Array, rowsPerCall: number): Float64Array {
    const wasm = wasmKernels();
    if (!wasm) throw new Error('the WebAssembly kernels did not load');
    const [lv, bv] = wasm.views(n * n, n);
    lv.set(l);
    bv.set(y);
    for (let i1 = n; i1 > 0; i1 -= rowsPerCall)
      wasm.exports.cholesky_back_rows(lv.byteOffset, n, bv.byteOffset, Math.max(0, i1 - rowsPerCall), i1);
    return bv.slice();
  }

  it.each([1, 2, 3, 7, 8, 9, 15, 16, 17, 31])(
    "solve L' x = y in its kernel bit for bit as the TypeScript does, however the rows are split (n = %i)",
    (n) => {
      useWasmKernels(false);
      const l = factorOf(n, 11 * n);
      const y = rightHandSide(n, 0, 5 * n);
      // The TypeScript's: below order 32 the solve stays there either way.
      const typescript = Float64Array.from(y);
      backSubstituteTransposed(l, n, typescript);
      useWasmKernels(true);
      // Eight rows at a time, and the rows left over one at a time, in any split into calls:
      // every row's sum is the same sum in the same order.
      for (const rows of [1, 3, 8, 13, 64]) expect(sameBits(backByKernel(l, n, y, rows), typescript)).toBe(true);
      // And x solves L' x = y: the residual, summed in increasing k (not the solve's order), at
      // rounding's scale.
      for (let i = 0; i < n; i++) {
        let s = -y[i];
        let scale = Math.abs(y[i]);
        for (let k = i; k < n; k++) {
          s += l[k * n + i] * typescript[k];
          scale += Math.abs(l[k * n + i] * typescript[k]);
        }
        expect(Math.abs(s)).toBeLessThanOrEqual(4 * n * Number.EPSILON * scale);
      }
    },
  );

  /**
   * A lower triangular L of order n with small integer entries and a diagonal of 1, 2 and 4, and
   * an integer x whose first `zeros` and last `trailing` entries are zero: b = L (L' x) is then
   * made exactly (every partial sum an integer far below 2^53, which doubles hold exactly; IEEE
   * 754), and so is every step of solving L L' x = b, in any order of summation.
   */
  function integerSystem(n: number, zeros: number, trailing: number, seed: number) {
    const r = randomMatrix(n + 1, n, seed).data;
    const l = new Float64Array(n * n);
    for (let i = 0; i < n; i++) {
      l[i * n + i] = [1, 2, 4][Math.floor((r[i * n + i] + 0.5) * 3)];
      for (let k = 0; k < i; k++) l[i * n + k] = Math.round(r[i * n + k] * 5) - (r[i * n + k] > 0.3 ? 1 : 0);
    }
    const x = new Float64Array(n);
    for (let i = zeros; i < n - trailing; i++) x[i] = Math.round(r[n * n + i] * 40);
    const y = new Float64Array(n);
    for (let i = 0; i < n; i++) for (let k = i; k < n; k++) y[i] += l[k * n + i] * x[k];
    const b = new Float64Array(n);
    for (let i = 0; i < n; i++) for (let k = 0; k <= i; k++) b[i] += l[i * n + k] * y[k];
    return { l, x, y, b };
  }

  it.each([
    [5, 0, 0],
    [45, 0, 0],
    [45, 6, 9],
    [72, 0, 3],
    [72, 20, 0],
    [133, 40, 17],
  ])(
    "solve an integer system L L' x = b exactly, both ways (n = %i, x with %i leading and %i trailing zeros)",
    (n, zeros, trailing) => {
      const { l, x, y, b } = integerSystem(n, zeros, trailing, 31 * n + zeros);
      expect(Math.max(...b.map(Math.abs))).toBeLessThan(2 ** 40);
      expect(x.some((v) => v !== 0)).toBe(true);
      const { wasm, typescript } = bothWays(() => {
        const both = Float64Array.from(b);
        choleskySolveInPlace(l, n, both);
        const back = Float64Array.from(y);
        backSubstituteTransposed(l, n, back);
        return { both, back };
      });
      // x itself, bit for bit, its zeros +0 (an exact zero sum is +0 when rounding to nearest).
      const exact = x.map((v) => v + 0);
      expect(sameBits(wasm.both, exact)).toBe(true);
      expect(sameBits(typescript.both, wasm.both)).toBe(true);
      expect(sameBits(wasm.back, exact)).toBe(true);
      expect(sameBits(typescript.back, wasm.back)).toBe(true);
      expect(sameBits(backByKernel(l, n, y, 8), wasm.back)).toBe(true);
    },
  );

  it('solve with a factor whether or not it is the last one the kernels made', () => {
    const n = 97;
    const b = rightHandSide(n, 0, 8);
    const solved = (l: Float64Array) => {
      const x = Float64Array.from(b);
      choleskySolveInPlace(l, n, x);
      return x;
    };
    const { wasm, typescript } = bothWays(() => {
      const first = factorOf(n, 1);
      const x1 = solved(first);
      // A small factor in between (a Schur complement's), then the first again.
      factorOf(3, 2);
      const x2 = solved(first);
      // Another large factor, and a cross product, then the first again, twice.
      const second = factorOf(n, 3);
      crossProduct(randomMatrix(40, 50, 4));
      const x3 = solved(first);
      const x4 = solved(first);
      // The second, factored again in place (a ridge added), is solved with its new factor.
      const again = positiveDefinite(n, 3);
      for (let i = 0; i < n; i++) again[i * n + i] += 1;
      second.set(again);
      expect(choleskyInPlace(second, n)).toBe(true);
      const x5 = solved(second);
      return [x1, x2, x3, x4, x5];
    });
    for (let k = 0; k < 5; k++) expect(sameBits(wasm[k], typescript[k])).toBe(true);
    expect(sameBits(wasm[0], wasm[3])).toBe(true);
    expect(sameBits(wasm[0], wasm[4])).toBe(false);
  });

  it.each([2, 3, 5, 31, 64, 65, 200, 513])(
    'find the eigenvalues and the exposures of a reduced matrix bit for bit as the TypeScript does (N = %i)',
    (n) => {
      const a = symmetric(n + 3, n, n * 17 + 2);
      const form = tridiagonalForm(a);
      const v = Array.from({ length: n }, (_, k) => ((k * 7919) % 13) / 13 - 0.4);
      const { wasm, typescript } = bothWays(() => ({ values: formEigenvalues(form), bets: formExposures(form, v) }));
      expect(sameBits(wasm.values, typescript.values)).toBe(true);
      expect(sameBits(wasm.bets.values, typescript.bets.values)).toBe(true);
      expect(sameBits(wasm.bets.exposures, typescript.bets.exposures)).toBe(true);
      // Not trivially: the iteration moved the diagonal.
      expect(sameBits(wasm.bets.values, form.diagonal)).toBe(false);
    },
  );

  it('find eigenvalues bit for bit at any scale, where the plain hypot would overflow or underflow, and of NaN', () => {
    const n = 40;
    for (const scale of [1, 1e-170, 1e-160, 1e140, 1e160, 1e300]) {
      const diag = Array.from({ length: n }, (_, k) => (2 + ((k * 31) % 7) / 10) * scale);
      const off = Array.from({ length: n - 1 }, (_, k) => (k % 5 === 4 ? 0 : -1 + k / 100) * scale);
      const { wasm, typescript } = bothWays(() => tridiagonalEigenvalues(diag, off));
      expect(sameBits(wasm, typescript)).toBe(true);
    }
    // Already diagonal, the textbook 2, -1 matrix (eigenvalues 2 - 2 cos(k pi / (n + 1))), and a NaN.
    for (const [diag, off] of [
      [
        [3, 1, 2, 5],
        [0, 0, 0],
      ],
      [new Array(50).fill(2), new Array(49).fill(-1)],
      [
        [1, 2, Number.NaN, 4],
        [0.5, 0.5, 0.5],
      ],
    ]) {
      const { wasm, typescript } = bothWays(() => tridiagonalEigenvalues(diag, off));
      expect(sameBits(wasm, typescript)).toBe(true);
    }
  });
});

describe("a kernel team helper's share of a WebAssembly kernel", () => {
  // In a helper whose module did not load on the team's memory, the share's arrays are plain
  // ones: it must make the TypeScript share on them, never run its own memory's kernels on
  // pointers that mean nothing there. This thread has no team, so helperKernels() is null here.
  const copies = (arrays: Float64Array[]) => arrays.map((a) => a.slice());

  it('is made in TypeScript, on its own arrays, when the helper has no kernels on the team memory', () => {
    expect(helperKernels()).toBeNull();
    expect(wasmKernels()).not.toBeNull();
    const t = 40;
    const n = 10;
    const packed = randomMatrix(1, 12 * t, 3).data;
    const cross = [packed, new Float64Array(n * n)];
    const crossTs = copies(cross);
    crossProductWasmShare(cross, [t, n, 1, 3]);
    crossProductShare(crossTs, [t, n, 1, 3]);
    expect(sameBits(cross[1], crossTs[1])).toBe(true);
    expect(cross[1].some((v) => v !== 0)).toBe(true);

    const m = 12;
    const pass = [
      randomMatrix(m, m, 4).data,
      ...[5, 6, 7].map((seed) => randomMatrix(1, m, seed).data),
      new Float64Array(m),
    ];
    const passTs = copies(pass);
    wasmPassShare(pass, [m, m, 5]);
    passShare(passTs, [m, m, 5]);
    expect(sameBits(pass[4], passTs[4])).toBe(true);
    expect(pass[4].some((v) => v !== 0)).toBe(true);

    const order = 40;
    const a = positiveDefinite(order, 8);
    const rows = [a.slice(), new Float64Array(32 * order)];
    const rowsTs = [a.slice()];
    // The rows below the first block of 32 columns.
    choleskyRowsWasmShare(rows, [order, 0, 32, 32, order]);
    choleskyRowsShare(rowsTs, [order, 0, 32, 32, order]);
    expect(sameBits(rows[0], rowsTs[0])).toBe(true);
    expect(sameBits(rows[0], a)).toBe(false);
  });
});
