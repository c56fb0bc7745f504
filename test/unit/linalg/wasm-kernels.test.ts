import { fileURLToPath } from 'node:url';
import { afterEach, describe, expect, it } from 'vitest';
import { kernelSourceDigest } from '../../../scripts/kernel-source-digest.mjs';
import { crossProduct, crossProductNaive } from '../../../shared-core/linalg/cross-product.js';
import type { Matrix } from '../../../shared-core/linalg/matrix.js';
import { tridiagonalForm, type TridiagonalForm } from '../../../shared-core/linalg/tridiagonal-form.js';
import { KERNEL_SOURCE_DIGEST } from '../../../shared-core/linalg/wasm/kernel-binary.js';
import { useWasmKernels, wasmKernels } from '../../../shared-core/linalg/wasm/wasm-kernels.js';
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
});
