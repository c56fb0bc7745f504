import { describe, expect, it } from 'vitest';
import { diffDocuments, showValue } from '../../../src-renderer/scenario/document-diff.js';

describe('differences between two scenario documents', () => {
  it('names each changed field by its JSON path, as the schema names them', () => {
    const a = {
      constraints: { weightBounds: { default: [0, 0.2] }, maxTurnover: 0.3 },
      candidates: [{ id: 'x', estimator: { method: 'sample' } }],
    };
    const b = {
      constraints: { weightBounds: { default: [0, 0.15] } },
      candidates: [{ id: 'x', estimator: { method: 'oas' } }],
    };
    expect(diffDocuments(a, b)).toEqual([
      { path: 'candidates[0].estimator.method', before: 'sample', after: 'oas' },
      { path: 'constraints.maxTurnover', before: 0.3, after: undefined },
      { path: 'constraints.weightBounds.default', before: [0, 0.2], after: [0, 0.15] },
    ]);
  });

  it('reads a section added or removed field by field, never as JSON', () => {
    const added = diffDocuments({ name: 'a' }, { name: 'a', backtest: { rebalance: 'monthly', costBps: 10 } });
    expect(added).toEqual([
      { path: 'backtest.costBps', before: undefined, after: 10 },
      { path: 'backtest.rebalance', before: undefined, after: 'monthly' },
    ]);
    expect(diffDocuments({ backtest: { cashRate: 0.01 } }, {})).toEqual([
      { path: 'backtest.cashRate', before: 0.01, after: undefined },
    ]);
    expect(showValue(0.01, 'backtest.cashRate')).toBe('1 %');
  });

  it('finds nothing between equal documents', () => {
    expect(diffDocuments({ a: [1, 2], b: { c: 'd' } }, { b: { c: 'd' }, a: [1, 2] })).toEqual([]);
  });

  it('shows values in one short line', () => {
    expect(showValue(undefined)).toBe('not set');
    expect(showValue([0, 0.15])).toBe('[0, 0.15]');
    expect(showValue([0, 0.15], 'constraints.weightBounds.default')).toBe('0 % to 15 %');
    expect(showValue('x'.repeat(100)).length).toBe(78);
  });
});
