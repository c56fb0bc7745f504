import { describe, expect, it } from 'vitest';
import { assetClassWords, canonicalAssetClass } from '../../../shared-core/scenario/asset-class.js';
import { parseScenario } from '../../../shared-core/scenario/schema.js';
import { costRates } from '../../../shared-core/walkforward/costs.js';

describe('asset classes have one spelling', () => {
  it('lower case, words joined by hyphens', () => {
    expect(canonicalAssetClass('Equity')).toBe('equity');
    expect(canonicalAssetClass('  Real assets ')).toBe('real-assets');
    expect(canonicalAssetClass('real_assets')).toBe('real-assets');
    expect(canonicalAssetClass('Money - market')).toBe('money-market');
    expect(assetClassWords('real-estate')).toBe('real estate');
  });

  it('a scenario file keeps that spelling whatever it wrote', () => {
    const parsed = parseScenario({
      format: 'holdfast-scenario@1',
      name: 'Classes',
      baseCurrency: 'EUR',
      assets: ['A', 'B'],
      assetInfo: { A: { assetClass: 'Equity' }, B: { assetClass: 'equity' } },
      candidates: [{ id: 'ew', estimator: { method: 'sample' }, objective: { method: 'equal-weight' } }],
    });
    expect(parsed.ok && parsed.scenario.assetInfo).toEqual({
      A: { assetClass: 'equity' },
      B: { assetClass: 'equity' },
    });
  });

  it('costs by class find the class in any spelling', () => {
    const rates = costRates(['A', 'B'], { Equity: 20, default: 5 }, { A: { assetClass: 'equity' } });
    expect(Array.from(rates)).toEqual([0.002, 0.0005]);
  });
});
