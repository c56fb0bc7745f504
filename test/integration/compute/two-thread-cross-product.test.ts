import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { estimateCovariance } from '../../../shared-core/estimators/registry.js';
import { crossProduct } from '../../../shared-core/linalg/cross-product.js';
import { zeros } from '../../../shared-core/linalg/matrix.js';
import { createTwoThreadCrossProduct } from '../../../src-main/compute/two-thread-cross-product.js';

/**
 * The command line's two-thread X'X (a worker thread computes the last rows with the core's
 * kernel) gives the single-thread numbers bit for bit. The worker runs from the build that
 * `npm test` makes first (dist/), as it does for `holdfast`.
 */
const script = new URL('../../../dist/src-main/compute/compute-thread.js', import.meta.url);

function returns(t: number, n: number) {
  let s = 7;
  const x = zeros(t, n);
  for (let k = 0; k < x.data.length; k++) {
    s = (s * 16807) % 2147483647;
    x.data[k] = (s / 2147483647 - 0.5) * 0.02;
  }
  return x;
}

describe('X’X on two threads (src-main/compute)', () => {
  it.runIf(existsSync(fileURLToPath(script)))(
    'the worker computes its rows and the matrix equals the one-thread kernel exactly; so does a Ledoit-Wolf estimate',
    () => {
      const two = createTwoThreadCrossProduct({ script, minWork: 0 });
      for (const [t, n] of [
        [300, 37],
        [120, 200],
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

  it('without the compiled worker script it computes every row itself', () => {
    const alone = createTwoThreadCrossProduct({ script: new URL('file:///nonexistent/thread.js'), minWork: 0 });
    const x = returns(50, 9);
    expect(Array.from(alone.crossProduct(x).data)).toEqual(Array.from(crossProduct(x).data));
    expect(alone.stats.rowsByWorker).toBe(0);
  });
});
