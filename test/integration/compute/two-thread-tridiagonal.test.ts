import { existsSync } from 'node:fs';
import { setTimeout as sleep } from 'node:timers/promises';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { effectiveBets } from '../../../shared-core/analytics/risk.js';
import { HAND_OFF_FROM, tridiagonalForm } from '../../../shared-core/linalg/tridiagonal-form.js';
import { createSecondThread } from '../../../src-main/compute/second-thread.js';
import { createTwoThreadTridiagonal } from '../../../src-main/compute/two-thread-tridiagonal.js';
import { computeThreadScript, sameBits, seededCovariance } from './seeded.js';

/**
 * The command line's two-thread tridiagonal reduction (the helper thread runs the second column
 * range of every step with the core's kernel) gives the single-thread numbers bit for bit. The
 * helper runs from the build that `npm test` makes first (dist/), as it does for `holdfast`.
 */
const script = computeThreadScript;
const covariance = (t: number, n: number) => seededCovariance(t, n, 11);

describe('the tridiagonal reduction on two threads (src-main/compute)', () => {
  it.runIf(existsSync(fileURLToPath(script)))(
    'the helper runs its half of the steps and the form equals the one-thread form exactly, rank-deficient or not',
    async () => {
      const thread = createSecondThread(script);
      thread.start();
      for (let k = 0; k < 400 && !thread.ready(); k++) await sleep(10); // loaded and compiled
      const two = createTwoThreadTridiagonal({ thread, minSize: 0 });
      for (const [t, n] of [
        [600, HAND_OFF_FROM + 241],
        [150, HAND_OFF_FROM + 90], // N > T: the smallest eigenvalue repeats
      ]) {
        const s = covariance(t, n);
        const a = tridiagonalForm(s);
        const b = two.tridiagonalise(s);
        for (const key of ['diagonal', 'offDiagonal', 'halfNorms', 'reflectors'] as const)
          expect(sameBits(a[key], b[key]), key).toBe(true);
        const w = new Float64Array(n).fill(1 / n);
        // The helper then records the QL iteration (rotations-ahead.ts) while the caller goes on (a
        // sleep here; a recording not begun when first read is taken back); the bets replay it exactly.
        await sleep(300);
        expect(b.rotations).toBeDefined();
        expect(effectiveBets(w, s, b)).toBe(effectiveBets(w, s));
      }
      expect(two.stats.stepsByHelper).toBeGreaterThan(0);
      // The helper is free again after each reduction: a third one still gets its help.
      const before = two.stats.stepsByHelper;
      two.tridiagonalise(covariance(300, HAND_OFF_FROM + 200));
      expect(two.stats.stepsByHelper).toBeGreaterThan(before);
    },
  );

  it('without the compiled helper script it runs every step itself', () => {
    const alone = createTwoThreadTridiagonal({ script: new URL('file:///nonexistent/thread.js'), minSize: 0 });
    const s = covariance(80, 30);
    expect(sameBits(alone.tridiagonalise(s).diagonal, tridiagonalForm(s).diagonal)).toBe(true);
    expect(alone.stats.stepsByHelper).toBe(0);
  });
});
