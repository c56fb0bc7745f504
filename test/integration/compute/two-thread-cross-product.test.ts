import { existsSync } from 'node:fs';
import { setTimeout as sleep } from 'node:timers/promises';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { estimateCovariance } from '../../../shared-core/estimators/registry.js';
import { crossProduct } from '../../../shared-core/linalg/cross-product.js';
import { createSecondThread } from '../../../src-main/compute/second-thread.js';
import {
  createTwoThreadCrossProduct,
  MIN_WORK,
  MIN_WORK_READY,
} from '../../../src-main/compute/two-thread-cross-product.js';
import { computeThreadScript, seededReturns } from './seeded.js';

/**
 * The command line's two-thread X'X (a worker thread computes the last rows with the core's
 * kernel) gives the single-thread numbers bit for bit. The worker runs from the build that
 * `npm test` makes first (dist/), as it does for `holdfast`.
 */
const script = computeThreadScript;
const returns = (t: number, n: number) => seededReturns(t, n, 7);

describe('X’X on two threads (src-main/compute)', () => {
  it.runIf(existsSync(fileURLToPath(script)))(
    'the worker computes row panels and the matrix equals the one-thread kernel exactly; so does a Ledoit-Wolf estimate',
    async () => {
      const thread = createSecondThread(script);
      thread.start();
      for (let k = 0; k < 400 && !thread.ready(); k++) await sleep(10);
      const two = createTwoThreadCrossProduct({ thread, minWork: 0 });
      // The two threads share the panels as they come: one that has not woken yet takes none, so
      // a loaded machine may need more than one pass before the worker has taken some.
      for (let pass = 0; pass < 10 && two.stats.rowsByWorker === 0; pass++)
        for (const [t, n] of [
          [300, 37],
          [1260, 200],
        ]) {
          const x = returns(t, n);
          const a = two.crossProduct(x);
          expect(Array.from(a.data)).toEqual(Array.from(crossProduct(x).data));
          const viaTwo = estimateCovariance(
            x,
            { method: 'ledoit-wolf' },
            { frequency: 'daily', crossProduct: two.crossProduct },
          );
          const viaOne = estimateCovariance(x, { method: 'ledoit-wolf' }, { frequency: 'daily' });
          expect(Array.from(viaTwo.covariance.data)).toEqual(Array.from(viaOne.covariance.data));
          expect(viaTwo.diagnostics.shrinkage).toBe(viaOne.diagnostics.shrinkage);
        }
      expect(two.stats.rowsByWorker).toBeGreaterThan(0);
    },
  );

  it.runIf(existsSync(fileURLToPath(script)))(
    'a thread started ahead reports ready from shared memory, and then takes jobs above MIN_WORK_READY only',
    async () => {
      const thread = createSecondThread(script);
      expect(thread.ready()).toBe(false);
      thread.start();
      // Polled without awaiting its 'online' event, as a synchronous caller would see it.
      for (let k = 0; k < 400 && !thread.ready(); k++) await sleep(10);
      expect(thread.ready()).toBe(true);
      const two = createTwoThreadCrossProduct({ thread });
      const [t, n] = [1260, 200]; // N(N+1)/2 T = 25.3 million multiply-adds
      expect((n * (n + 1) * t) / 2).toBeGreaterThan(MIN_WORK_READY);
      expect((n * (n + 1) * t) / 2).toBeLessThan(MIN_WORK);
      const x = returns(t, n);
      // Panels are shared as they come: on a loaded machine the worker may wake too late for one pass.
      for (let pass = 0; pass < 10 && two.stats.rowsByWorker === 0; pass++)
        expect(Array.from(two.crossProduct(x).data)).toEqual(Array.from(crossProduct(x).data));
      expect(two.stats.rowsByWorker).toBeGreaterThan(0);
      const before = two.stats.rowsByWorker;
      two.crossProduct(returns(100, 40)); // below MIN_WORK_READY: all on the calling thread
      expect(two.stats.rowsByWorker).toBe(before);
    },
  );

  it('without the compiled worker script it computes every row itself', () => {
    const alone = createTwoThreadCrossProduct({ script: new URL('file:///nonexistent/thread.js'), minWork: 0 });
    const x = returns(50, 9);
    expect(Array.from(alone.crossProduct(x).data)).toEqual(Array.from(crossProduct(x).data));
    expect(alone.stats.rowsByWorker).toBe(0);
  });
});
