import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { optimal } from '../../support/candidate-status.js';
import { canonicalJson, hashedInput, memoHash } from '../../../src-main/memo/memo-hash.js';
import { MEMO_LAYOUT_VERSION } from '../../../src-main/memo/memo-input.js';
import { memoFixture } from './memo-fixture.js';

describe('the memo hash (SHA-256 of the canonical JSON of layout version and input)', () => {
  it('is reproducible from its definition with an independent SHA-256 over the canonical text', () => {
    const input = memoFixture();
    const text = canonicalJson({ layout: MEMO_LAYOUT_VERSION, input: hashedInput(input) });
    expect(memoHash(input)).toBe(createHash('sha256').update(text, 'utf8').digest('hex'));
  });

  it('canonical JSON sorts keys, drops undefined members and writes typed arrays as arrays', () => {
    expect(canonicalJson({ b: 1, a: [1, 2], c: undefined, d: new Float64Array([0.5, 2]) })).toBe(
      '{"a":[1,2],"b":1,"d":[0.5,2]}',
    );
    expect(canonicalJson({ x: NaN, y: -Infinity, z: 'é' })).toBe('{"x":"NaN","y":"-Infinity","z":"é"}');
  });

  it('leaves out the solver wall time, which the memo does not print', () => {
    const a = memoFixture();
    const b = memoFixture();
    b.run.candidates[0].solver.ms += 17;
    expect(memoHash(b)).toBe(memoHash(a));
    expect(hashedInput(b).run.candidates[0].solver.ms).toBe(0);
  });

  it('does not depend on key order, and changes with any printed input', () => {
    const a = memoFixture();
    const reordered = Object.fromEntries(Object.entries(memoFixture()).reverse()) as typeof a;
    expect(memoHash(reordered)).toBe(memoHash(a));
    const b = memoFixture();
    optimal(b.run.candidates[0]).weights['ALD-EQ'] += 1e-9;
    expect(memoHash(b)).not.toBe(memoHash(a));
    const c = memoFixture();
    c.lot = 500;
    expect(memoHash(c)).not.toBe(memoHash(a));
  });
});
