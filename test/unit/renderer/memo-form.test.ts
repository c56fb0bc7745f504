import { describe, expect, it } from 'vitest';
import {
  base64Bytes,
  checkLot,
  checkMemoDate,
  memoFileName,
  revisionNumberOf,
} from '../../../src-renderer/scenario/memo/memo-form.js';

describe('the memo form as typed', () => {
  it('reads a lot size the way amounts are typed elsewhere in the app', () => {
    expect(checkLot('1,000')).toEqual({ ok: true, value: 1000 });
    expect(checkLot('2500')).toEqual({ ok: true, value: 2500 });
    expect(checkLot('10 000')).toEqual({ ok: true, value: 10000 });
    expect(checkLot('0.5')).toEqual({ ok: true, value: 0.5 });
  });

  it('gives the reason a lot size cannot be used', () => {
    expect(checkLot('')).toEqual({ ok: false, reason: 'enter the lot size, such as 1,000' });
    expect(checkLot('0')).toEqual({ ok: false, reason: 'a lot size must be more than zero' });
    expect(checkLot('-500')).toEqual({ ok: false, reason: 'a lot size cannot be negative' });
    expect(checkLot('ten')).toMatchObject({ ok: false });
    expect(checkLot('1e400')).toMatchObject({ ok: false });
  });

  it('accepts calendar dates only (2024 is a leap year, 2025 is not: common practice, Gregorian calendar)', () => {
    expect(checkMemoDate('2026-12-02')).toEqual({ ok: true, value: '2026-12-02' });
    expect(checkMemoDate('2024-02-29')).toEqual({ ok: true, value: '2024-02-29' });
    expect(checkMemoDate('2025-02-29')).toEqual({ ok: false, reason: '2025-02-29 is not a day of the calendar' });
    expect(checkMemoDate('02/12/2026')).toEqual({ ok: false, reason: 'write the date as YYYY-MM-DD' });
    expect(checkMemoDate('')).toEqual({ ok: false, reason: 'enter the date the memo carries' });
  });

  it('finds the revision a memo was printed from by its fingerprint', () => {
    const revisions = [
      { number: 3, hash: 'c' },
      { number: 2, hash: 'b' },
    ];
    expect(revisionNumberOf('b', revisions)).toBe(2);
    expect(revisionNumberOf('z', revisions)).toBeNull();
  });

  it('names the downloaded file from the household, scenario, date and revision, in safe characters', () => {
    expect(
      memoFileName({ household: 'Mörk & Vale family', scenario: 'Retirement: 2030', date: '2026-12-02', revision: 4 }),
    ).toBe('mork-vale-family-retirement-2030-2026-12-02-rev4.pdf');
    expect(
      memoFileName({
        household: 'Maraval-Lindqvist family (invented)',
        scenario: 'Annual review 2025 (invented demonstration)',
        date: '2026-12-02',
        revision: 2,
      }),
    ).toBe('maraval-lindqvist-family-invented-annual-review-2025-invented-2026-12-02-rev2.pdf');
    expect(memoFileName({ household: 'x'.repeat(60), scenario: 's', date: '2026-12-02', revision: 1 })).toBe(
      `${'x'.repeat(40)}-s-2026-12-02-rev1.pdf`,
    );
    expect(memoFileName({ household: '***', scenario: '', date: '2026-12-02', revision: null })).toBe(
      'memo-memo-2026-12-02.pdf',
    );
  });

  it('turns base64 back into the same bytes (RFC 4648 test vectors)', () => {
    const text = (b: Uint8Array) => String.fromCharCode(...b);
    expect(text(base64Bytes(''))).toBe('');
    expect(text(base64Bytes('Zg=='))).toBe('f');
    expect(text(base64Bytes('Zm9vYg=='))).toBe('foob');
    expect(text(base64Bytes('Zm9vYmFy'))).toBe('foobar');
    const all = Uint8Array.from({ length: 256 }, (_, i) => i);
    expect([...base64Bytes(Buffer.from(all).toString('base64'))]).toEqual([...all]);
  });
});
