import { describe, expect, it } from 'vitest';
import type { Asset } from '../../../shared-core/contract/service-api.js';
import type { ScenarioInput } from '../../../shared-core/scenario/schema.js';
import {
  addEstimator,
  addObjective,
  editorStateFor,
  removeEstimator,
  setAssets,
  setCell,
  updateEstimator,
} from '../../../src-renderer/scenario/editor-state.js';

const doc: ScenarioInput = {
  format: 'holdfast-scenario@1',
  name: 'Test',
  baseCurrency: 'EUR',
  assets: ['A', 'B', 'C'],
  constraints: {
    weightBounds: { default: [0, 0.5], C: [0, 0.2] },
    groups: [{ name: 'Equity', members: ['A', 'C'], max: 0.6 }],
  },
  expectedReturns: { A: 0.05, C: 0.03 },
  candidates: [{ id: 'md-lw', estimator: { method: 'ledoit-wolf' }, objective: { method: 'max-diversification' } }],
  recommended: 'md-lw',
};

const asset = (id: string, liquidity: Asset['liquidity'] = 'daily'): Asset => ({
  id,
  name: `Fund ${id}`,
  assetClass: 'equity',
  region: 'europe',
  currency: 'EUR',
  liquidity,
  lockUpDays: null,
  notes: '',
  fx: null,
});

describe('editor edits', () => {
  it('builds 3 estimators x 2 objectives into 6 candidates by adding rows and columns', () => {
    let s = editorStateFor(doc);
    s = addEstimator(s, { method: 'sample' });
    s = addEstimator(s, { method: 'ewma', lambda: 0.97 });
    s = addObjective(s, { method: 'min-variance' });
    expect(s.doc.candidates.map((c) => c.id)).toEqual([
      'md-lw',
      'lw-minvar',
      'sample-maxdiv',
      'sample-minvar',
      'ewma-maxdiv',
      'ewma-minvar',
    ]);
    expect(s.doc.recommended).toBe('md-lw');
  });

  it('unticks a cell and drops the recommendation that pointed at it', () => {
    const s = setCell(editorStateFor(doc), { method: 'ledoit-wolf' }, { method: 'max-diversification' }, false);
    expect(s.doc.candidates).toEqual([]);
    expect(s.doc.recommended).toBeUndefined();
    expect(s.grid.estimators).toHaveLength(1);
  });

  it('changes an estimator option and keeps the cells ticked', () => {
    let s = addEstimator(editorStateFor(doc), { method: 'ewma', lambda: 0.97 });
    s = updateEstimator(s, 1, { method: 'ewma', halfLife: 30 });
    expect(s.doc.candidates.map((c) => c.estimator)).toEqual([
      { method: 'ledoit-wolf' },
      { method: 'ewma', halfLife: 30 },
    ]);
    s = removeEstimator(s, 0);
    expect(s.doc.candidates.map((c) => c.id)).toEqual(['ewma-maxdiv']);
  });

  it('removing an asset removes its own bound, expected return and band membership; adding one copies its store tags', () => {
    const s = setAssets(editorStateFor(doc), ['A', 'B', 'D'], [asset('D', 'illiquid')]);
    expect(s.doc.constraints?.weightBounds).toEqual({ default: [0, 0.5] });
    expect(s.doc.constraints?.groups?.[0].members).toEqual(['A']);
    expect(s.doc.expectedReturns).toEqual({ A: 0.05 });
    expect(s.doc.assetInfo?.D).toEqual({
      name: 'Fund D',
      liquidity: 'illiquid',
      assetClass: 'equity',
      region: 'europe',
      currency: 'EUR',
    });
  });
});
