import { existsSync } from 'node:fs';
import { setTimeout as sleep } from 'node:timers/promises';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { formExposures } from '../../../shared-core/linalg/symmetric-eigen.js';
import { tridiagonalForm } from '../../../shared-core/linalg/tridiagonal-form.js';
import { createSecondThread } from '../../../src-main/compute/second-thread.js';
import { createTridiagonalAhead } from '../../../src-main/compute/tridiagonal-ahead.js';
import { computeThreadScript, sameBits, seededCovariance } from './seeded.js';

/**
 * The reduction started ahead on the helper thread (holdfast solve solves meanwhile) gives the
 * calling thread's form bit for bit.
 */
const script = computeThreadScript;
const covariance = (t: number, n: number) => seededCovariance(t, n, 13);

describe('the tridiagonal reduction started ahead (src-main/compute)', () => {
  it.runIf(existsSync(fileURLToPath(script)))(
    'once the thread is up, the helper reduces while the caller goes on, and the form equals the one-thread form exactly',
    async () => {
      const thread = createSecondThread(script);
      const ahead = createTridiagonalAhead({ thread, minSize: 0 });
      const s = covariance(400, 160);
      expect(ahead.start(s)).toBeUndefined(); // not started: nothing is handed over
      thread.start();
      for (let k = 0; k < 400 && !thread.ready(); k++) await sleep(10);
      const a = tridiagonalForm(s);
      // The caller goes on meanwhile (a sleep here); a helper that has not begun by the wait is
      // taken back, so a loaded machine may need another try.
      let b = a;
      for (let attempt = 1; attempt <= 10 && ahead.stats.byHelper === 0; attempt++) {
        const wait = ahead.start(s)!;
        expect(wait).toBeTypeOf('function');
        await sleep(50 * attempt);
        b = wait();
        expect(wait()).toBe(b); // waited for once
        for (const key of ['diagonal', 'offDiagonal', 'halfNorms', 'reflectors'] as const)
          expect(sameBits(a[key], b[key]), key).toBe(true);
      }
      expect(ahead.stats.byHelper).toBe(1);
      // The helper's recorded QL: the effective bets' exposures replay it, with the same bits.
      expect(b.rotations).toBeDefined();
      const w = Array.from({ length: 160 }, (_, i) => (i % 3) / 160);
      const [x, y] = [formExposures(a, w), formExposures(b, w)];
      expect(Array.from(y.exposures).every((v, i) => Object.is(v, x.exposures[i]))).toBe(true);
      // Outside [minSize, maxSize) the caller reduces synchronously (undefined here).
      const bounded = createTridiagonalAhead({ thread, minSize: 200, maxSize: 300 });
      expect(bounded.start(s)).toBeUndefined();
      expect(bounded.start(covariance(400, 300))).toBeUndefined();
    },
  );

  it('without the compiled helper script nothing is started', () => {
    const alone = createTridiagonalAhead({ script: new URL('file:///nonexistent/thread.js'), minSize: 0 });
    expect(alone.start(covariance(80, 30))).toBeUndefined();
  });
});
