import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { KernelTeam } from '../../../shared-core/linalg/kernel-team.js';
import { randomMatrix, sameBits } from '../../support/random-matrix.js';

/**
 * The command line's second thread for the dense kernels (src-main/threads/, shared-core/linalg/
 * kernel-team.ts). A worker thread runs built JavaScript, so this runs on dist/ after a build, as
 * `npm test` does: the built kernels with the team installed against the same kernels without it.
 * The specification: the same answer bit for bit, whichever thread makes a share. The team serves
 * the TypeScript kernels (where the WebAssembly ones cannot run), so these switch WebAssembly off.
 */
const dist = fileURLToPath(new URL('../../../dist/', import.meta.url));
const built = existsSync(`${dist}src-main/threads/kernel-worker.js`);

interface Modules {
  team: typeof import('../../../shared-core/linalg/kernel-team.js');
  threads: typeof import('../../../src-main/threads/kernel-team.js');
  cross: typeof import('../../../shared-core/linalg/cross-product.js');
  tridiagonal: typeof import('../../../shared-core/linalg/tridiagonal-form.js');
  factor: typeof import('../../../shared-core/optimise/qp/dense-factor.js');
  wasm: typeof import('../../../shared-core/linalg/wasm/wasm-kernels.js');
  prepare: typeof import('../../../shared-core/estimators/prepare-kernel-team.js');
}
let m: Modules;

/** Jobs the helper thread took in the last `withAndWithout`: the team was really used. */
let taken = 0;

/** The command line's team, wrapped to count the jobs its helper takes and the calls to prepare. */
function countingTeam(): { team: KernelTeam; counts: { taken: number; prepared: number } } {
  const team = m.threads.kernelTeamOfTwo()!;
  const counts = { taken: 0, prepared: 0 };
  return {
    counts,
    team: {
      shared: (length) => team.shared(length),
      memory: team.memory,
      fork: (job) => {
        const forked = team.fork(job);
        if (forked) counts.taken++;
        return forked;
      },
      join: () => team.join(),
      prepare: () => {
        counts.prepared++;
        team.prepare();
      },
    },
  };
}

/** Runs `f` once without a team and once with one; both answers. */
function withAndWithout<T>(f: () => T): { alone: T; shared: T } {
  m.team.installKernelTeam(null);
  const alone = f();
  const counted = countingTeam();
  m.team.installKernelTeam(counted.team);
  try {
    return { alone, shared: f() };
  } finally {
    taken = counted.counts.taken;
    m.team.installKernelTeam(null);
  }
}

/** `f` with the WebAssembly kernels on: this file runs the TypeScript kernels otherwise. */
function inWasm(f: () => void): void {
  m.wasm.useWasmKernels(true);
  try {
    f();
  } finally {
    m.wasm.useWasmKernels(false);
  }
}

/** X'X of a random 900 x n X plus 1e-3 I: symmetric positive definite. */
function positiveDefinite(n: number, seed: number): Float64Array {
  const a = m.cross.crossProduct(randomMatrix(900, n, seed)).data;
  for (let i = 0; i < n; i++) a[i * n + i] += 1e-3;
  return a;
}

/** The Cholesky factor of a copy of `a`: whether it factored, and the copy as the factor left it. */
function factorCopy(a: Float64Array, n: number): { ok: boolean; f: Float64Array } {
  const f = Float64Array.from(a);
  return { ok: m.factor.choleskyInPlace(f, n), f };
}

describe.runIf(built)('the dense kernels on two threads', () => {
  beforeAll(async () => {
    m = {
      team: await import(`${dist}shared-core/linalg/kernel-team.js`),
      threads: await import(`${dist}src-main/threads/kernel-team.js`),
      cross: await import(`${dist}shared-core/linalg/cross-product.js`),
      tridiagonal: await import(`${dist}shared-core/linalg/tridiagonal-form.js`),
      factor: await import(`${dist}shared-core/optimise/qp/dense-factor.js`),
      wasm: await import(`${dist}shared-core/linalg/wasm/wasm-kernels.js`),
      prepare: await import(`${dist}shared-core/estimators/prepare-kernel-team.js`),
    };
    m.wasm.useWasmKernels(false);
  });
  afterAll(() => {
    m?.team.installKernelTeam(null);
    m?.wasm.useWasmKernels(true);
  });

  it("makes the cross product X'X bit for bit as one thread does (N = 760, T = 1000)", () => {
    const x = randomMatrix(1000, 760, 11);
    const { alone, shared } = withAndWithout(() => m.cross.crossProduct(x));
    expect(sameBits(alone.data, shared.data)).toBe(true);
    expect(taken).toBe(1);
    // And it is X'X: one entry against its defining sum.
    let s = 0;
    for (let k = 0; k < 1000; k++) s += x.data[k * 760 + 3] * x.data[k * 760 + 700];
    expect(shared.data[3 * 760 + 700]).toBeCloseTo(s, 10);
  });

  it("makes X'X in WebAssembly on the team's shared memory, both threads, bit for bit (N = 1000, T = 1100)", () => {
    const x = randomMatrix(1100, 1000, 15);
    const typescript = m.cross.crossProduct(x);
    inWasm(() => {
      const { alone, shared } = withAndWithout(() => m.cross.crossProduct(x));
      expect(taken).toBe(1);
      expect(sameBits(alone.data, typescript.data)).toBe(true);
      expect(sameBits(shared.data, typescript.data)).toBe(true);
    });
  });

  it("factors and solves in WebAssembly on the team's shared memory, the TypeScript's answer (n = 701)", () => {
    const n = 701;
    const a = positiveDefinite(n, 16);
    const b = randomMatrix(1, n, 17).data;
    const solve = () => {
      const f = Float64Array.from(a);
      const x = Float64Array.from(b);
      const ok = m.factor.choleskyInPlace(f, n);
      m.factor.choleskySolveInPlace(f, n, x);
      return { ok, f, x, onShared: m.wasm.wasmKernels()?.shared };
    };
    const typescript = solve();
    inWasm(() => {
      const { alone, shared } = withAndWithout(solve);
      expect([alone.onShared, shared.onShared]).toEqual([false, true]);
      expect(typescript.ok && alone.ok && shared.ok).toBe(true);
      for (const r of [alone, shared]) {
        expect(sameBits(r.f, typescript.f)).toBe(true);
        expect(sameBits(r.x, typescript.x)).toBe(true);
      }
    });
  });

  it("factors in WebAssembly on the team's shared memory, both threads, the TypeScript's factor (n = 701)", () => {
    const n = 701;
    const a = positiveDefinite(n, 16);
    const typescript = Float64Array.from(a);
    expect(m.factor.choleskyInPlace(typescript, n)).toBe(true);
    const indefinite = Float64Array.from(a);
    indefinite[650 * n + 650] = -1;
    inWasm(() => {
      const { alone, shared } = withAndWithout(() => factorCopy(a, n));
      expect(taken).toBeGreaterThan(10); // the rows below most of the 22 blocks
      expect(alone.ok && shared.ok).toBe(true);
      expect(sameBits(alone.f, typescript)).toBe(true);
      expect(sameBits(shared.f, typescript)).toBe(true);
      const refused = withAndWithout(() => factorCopy(indefinite, n));
      expect([refused.alone.ok, refused.shared.ok]).toEqual([false, false]);
      expect(sameBits(refused.alone.f, refused.shared.f)).toBe(true);
    });
  });

  it('reduces a symmetric matrix to the same tridiagonal form and reflectors (N = 640)', () => {
    const c = m.cross.crossProduct(randomMatrix(700, 640, 12));
    const { alone, shared } = withAndWithout(() => m.tridiagonal.tridiagonalForm(c));
    expect(sameBits(alone.diagonal, shared.diagonal)).toBe(true);
    expect(sameBits(alone.offDiagonal, shared.offDiagonal)).toBe(true);
    expect(sameBits(alone.reflectors, shared.reflectors)).toBe(true);
    expect(taken).toBeGreaterThan(100); // every pass over 512 columns or more
  });

  it('reduces in WebAssembly on the shared memory, both threads, to the TypeScript form bit for bit (N = 900)', () => {
    const c = m.cross.crossProduct(randomMatrix(950, 900, 16));
    // Zero rows and columns: steps with nothing to reflect among the shared passes.
    for (const z of [5, 880]) for (let k = 0; k < 900; k++) c.data[z * 900 + k] = c.data[k * 900 + z] = 0;
    const typescript = m.tridiagonal.tridiagonalForm(c);
    inWasm(() => {
      const { alone, shared } = withAndWithout(() => m.tridiagonal.tridiagonalForm(c));
      expect(taken).toBeGreaterThan(100); // every pass over 768 columns or more
      for (const form of [alone, shared]) {
        expect(sameBits(form.diagonal, typescript.diagonal)).toBe(true);
        expect(sameBits(form.offDiagonal, typescript.offDiagonal)).toBe(true);
        expect(sameBits(form.reflectors, typescript.reflectors)).toBe(true);
        expect(sameBits(form.halfNorms, typescript.halfNorms)).toBe(true);
      }
    });
  });

  it('factors the same Cholesky factor, and refuses the same indefinite matrix (n = 701)', () => {
    const n = 701;
    const a = positiveDefinite(n, 13);
    const { alone, shared } = withAndWithout(() => factorCopy(a, n));
    expect(alone.ok).toBe(true);
    expect(shared.ok).toBe(true);
    expect(sameBits(alone.f, shared.f)).toBe(true);
    expect(taken).toBeGreaterThan(10); // the rows below most of the 22 blocks
    // L L' = A on an entry far below the first block: the factor is a factor.
    let s = 0;
    for (let k = 0; k <= 650; k++) s += shared.f[690 * n + k] * shared.f[650 * n + k];
    expect(s).toBeCloseTo(a[690 * n + 650], 9);
    const indefinite = Float64Array.from(a);
    indefinite[600 * n + 600] = -1;
    const refused = withAndWithout(() => m.factor.choleskyInPlace(Float64Array.from(indefinite), n));
    expect(refused).toEqual({ alone: false, shared: false });
  });

  it('starts the helper ahead of estimates whose kernels will split, and never for small ones', () => {
    // The command line's path: WebAssembly on the team's memory. N = 300 at T = 1260 splits
    // nothing (X'X below 2^30 multiply-adds, the reduction's passes below 768 columns); N = 1000
    // splits X'X. The helper started ahead takes the product's first share.
    const { team, counts } = countingTeam();
    m.team.installKernelTeam(team);
    try {
      inWasm(() => {
        m.prepare.prepareKernelTeamForEstimates(300, 1260);
        m.prepare.prepareKernelTeamForEstimates(800, 60);
        expect(counts.prepared).toBe(1);
        m.prepare.prepareKernelTeamForEstimates(1000, 1100);
        expect(counts.prepared).toBe(2);
        const x = randomMatrix(1100, 1000, 21);
        const c = m.cross.crossProduct(x);
        expect(counts.taken).toBe(1);
        let s = 0;
        for (let k = 0; k < 1100; k++) s += x.data[k * 1000 + 5] * x.data[k * 1000 + 999];
        expect(c.data[5 * 1000 + 999]).toBeCloseTo(s, 10);
      });
    } finally {
      m.team.installKernelTeam(null);
    }
  });

  it('leaves every kernel on one thread, after one bounded wait, when the helper cannot start', () => {
    const team = m.threads.kernelTeamOfTwo(new URL(`file://${dist}src-main/threads/no-such-worker.js`))!;
    const job = { kernel: 'cross-product', buffers: [team.shared(4)], ints: [] };
    const first = performance.now();
    expect(team.fork(job)).toBe(false);
    expect(performance.now() - first).toBeLessThan(5000);
    const again = performance.now();
    expect(team.fork(job)).toBe(false);
    expect(performance.now() - again).toBeLessThan(50);
    // And the kernels still answer, alone.
    m.team.installKernelTeam(team);
    try {
      const x = randomMatrix(1000, 760, 14);
      const c = m.cross.crossProduct(x);
      let s = 0;
      for (let k = 0; k < 1000; k++) s += x.data[k * 760] * x.data[k * 760 + 759];
      expect(c.data[759]).toBeCloseTo(s, 10);
    } finally {
      m.team.installKernelTeam(null);
    }
  });

  it('refuses a job whose buffers are not shared, and names the problem', () => {
    const team = m.threads.kernelTeamOfTwo();
    expect(team).not.toBeNull();
    expect(() => team!.fork({ kernel: 'cross-product', buffers: [new Float64Array(4)], ints: [] })).toThrow(
      /not shared/,
    );
    expect(() => team!.fork({ kernel: 'no-such-share', buffers: [], ints: [] })).toThrow(/no share named/);
  });
});
