import { fileURLToPath } from 'node:url';
import { afterEach, describe, expect, it } from 'vitest';
import { kernelSourceDigest } from '../../../scripts/kernel-source-digest.mjs';
import { crossProduct, crossProductNaive } from '../../../shared-core/linalg/cross-product.js';
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
});
