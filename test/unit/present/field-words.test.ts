import { describe, expect, it } from 'vitest';
import { InputError } from '../../../shared-core/errors.js';
import { describeField, fieldWords, formatFieldError } from '../../../shared-core/present/field-words.js';
import { daysInLocale, formatDay } from '../../../shared-core/present/format.js';
import { parseScenario } from '../../../shared-core/scenario/schema.js';
import { showValue } from '../../../src-renderer/scenario/document-diff.js';

/** The words the screens and the command line give a field of the scenario: one table for both. */
describe('a field of the scenario in its own words', () => {
  it('names a candidate’s own limits as the scenario’s, in per cent', () => {
    expect(fieldWords('candidates[1].constraints.weightBounds.default')).toEqual({
      label: 'Every asset between (candidate 2)',
      unit: 'percent',
    });
    // The change a revision shows beside the draft: no fraction, no JSON.
    expect(showValue([0, 0.15], 'candidates[0].constraints.weightBounds.default')).toBe('0 % to 15 %');
  });

  it('says a schema limit in the field’s unit on screen', () => {
    expect(describeField('backtest.estimationWindow', 'Too small: expected number to be >=3')).toBe(
      'Estimation window (walk-forward): the estimation window (walk-forward) must be at least 3 return periods',
    );
  });

  it('the command line keeps file and JSON path, and says the rest in the same words', () => {
    const located = (message: string, path: string) => new InputError(message, { file: 'b.json', path });
    expect(formatFieldError(located('Too small: expected number to be >=3', 'backtest.estimationWindow'))).toBe(
      'b.json: backtest.estimationWindow: the estimation window (walk-forward) must be at least 3 return periods',
    );
    // A share of the portfolio in per cent, with the fraction the file holds beside it.
    expect(formatFieldError(located('Too big: expected number to be <=1', 'constraints.illiquidMax'))).toBe(
      'b.json: constraints.illiquidMax: the cap on illiquid assets together must be at most 100 % (1 in the file)',
    );
    // Another file's field keeps its message.
    expect(formatFieldError(located('expected a number', 'positions[0].amount'))).toBe(
      'b.json: positions[0].amount: expected a number',
    );
  });

  it('covers what the schema itself says about a real document', () => {
    const parsed = parseScenario({
      format: 'holdfast-scenario@1',
      name: 'Words',
      baseCurrency: 'EUR',
      candidates: [{ id: 'ew', estimator: { method: 'sample' }, objective: { method: 'equal-weight' } }],
      backtest: { estimationWindow: 2 },
    });
    expect(parsed.ok).toBe(false);
    if (parsed.ok) return;
    expect(parsed.errors.map((e) => formatFieldError(e.inFile('s.json')))).toEqual([
      's.json: backtest.estimationWindow: the estimation window (walk-forward) must be at least 3 return periods',
    ]);
  });

  it('days in the reader’s locale on screen, in ISO 8601 on the command line', () => {
    const message = 'no price date after the first rebalance (2019-01-31): nothing to walk forward';
    expect(describeField('backtest.from', message)).toBe(
      `Walk-forward start (date): no price date after the first rebalance (${formatDay('2019-01-31', undefined)}): nothing to walk forward`,
    );
    expect(describeField('backtest.from', message)).not.toContain('2019-01-31');
    expect(formatFieldError(new InputError(message, { file: 's.json', path: 'backtest.from' }))).toBe(
      `s.json: backtest.from: ${message}`,
    );
  });
});

describe('days inside a sentence of the core', () => {
  it("are shown in the reader's locale on screens, every one of them", () => {
    expect(
      daysInLocale(
        'HF-LS starts on 2018-01-31, after the window start 2017-12-31: the common window starts there',
        'en-US',
      ),
    ).toBe('HF-LS starts on Jan 31, 2018, after the window start Dec 31, 2017: the common window starts there');
    expect(daysInLocale('no date here, 20180131 stays', 'en-US')).toBe('no date here, 20180131 stays');
  });
});
