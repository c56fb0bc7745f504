import { describe, expect, it } from 'vitest';
import { optimal } from '../../support/candidate-status.js';
import { InputError } from '../../../shared-core/errors.js';
import { buildMemoInput, chooseRecommended, metricsFor } from '../../../src-main/memo/build-memo-input.js';
import { parseHoldingsText } from '../../../src-main/memo/memo-sources.js';
import { ASSETS, covariance, memoFixture, scenarioDocument } from './memo-fixture.js';

function errorOf(fn: () => unknown): InputError {
  try {
    fn();
  } catch (error) {
    if (error instanceof InputError) return error;
    throw error;
  }
  throw new Error('expected an InputError');
}

describe('holdings files for holdfast memo', () => {
  it('reads the demo household document (baseAmount in the base currency) and a plain positions document', () => {
    const demo = parseHoldingsText(
      JSON.stringify({
        format: 'holdfast-demo-household@1',
        household: { name: 'Maraval-Lindqvist family (invented)', baseCurrency: 'EUR' },
        asOf: '2025-12-31',
        holdings: [{ asset: 'LMI-US', currency: 'USD', amount: 11_000_000, baseAmount: 9_500_000.5 }],
      }),
    );
    expect(demo).toEqual({
      householdName: 'Maraval-Lindqvist family (invented)',
      baseCurrency: 'EUR',
      asOf: '2025-12-31',
      positions: [{ asset: 'LMI-US', amount: 9_500_000.5 }],
    });
    expect(parseHoldingsText('{"positions":[{"asset":"A","amount":5}]}')).toEqual({
      asOf: null,
      positions: [{ asset: 'A', amount: 5 }],
    });
  });

  it('names the JSON path, line and column of what is wrong', () => {
    expect(errorOf(() => parseHoldingsText('{"positions":[{"asset":"A","amount":-5}]}')).location.path).toBe(
      'positions[0].amount',
    );
    expect(errorOf(() => parseHoldingsText('{"positions":[{"amount":5}]}')).location.path).toBe('positions[0].asset');
    expect(errorOf(() => parseHoldingsText('{"holdings":[]}')).location.path).toBe('positions');
    expect(errorOf(() => parseHoldingsText('{\n  "positions": [,]\n}')).location).toMatchObject({ line: 2 });
  });
});

describe('buildMemoInput from a scenario run', () => {
  const fixture = memoFixture();
  const cov = covariance(ASSETS.length);
  const run = {
    candidates: fixture.run.candidates,
    estimates: Object.fromEntries(
      fixture.run.candidates.map((c) => [
        c.id,
        {
          assets: ASSETS,
          covariance: cov,
          estimate: {
            method: 'ledoit-wolf' as const,
            covariance: cov,
            periodsPerYear: 252,
            diagnostics: { observations: 1259, effectiveObservations: 1259, conditionNumber: 400, shrinkage: 0.2 },
          },
        },
      ]),
    ),
    returns: { dates: ['2021-12-01', '2026-11-30'], warnings: ['a warning'] },
  };
  const base = {
    scenario: scenarioDocument(),
    revision: { number: 2, hash: 'ab'.repeat(32) },
    run,
    household: fixture.household,
    preparedBy: 'AI',
    createdOn: '2026-12-01',
    lot: 1000,
    data: fixture.data,
  };

  it("measures the current holdings with the recommended candidate's estimate through shared-core/analytics/risk", () => {
    const input = buildMemoInput(base);
    const positions = fixture.household.holdings!.positions;
    const total = positions.reduce((s, p) => s + p.amount, 0);
    const current = Object.fromEntries(positions.map((p) => [p.asset, p.amount / total]));
    expect(input.currentMetrics).toEqual(metricsFor(current, ASSETS, cov));
    // Volatility is sqrt(w' Sigma w), computed here by hand.
    const w = ASSETS.map((a) => current[a] ?? 0);
    let v = 0;
    for (let i = 0; i < w.length; i++) for (let j = 0; j < w.length; j++) v += w[i] * w[j] * cov.data[i * w.length + j];
    expect(input.currentMetrics!.volatility).toBeCloseTo(Math.sqrt(v), 12);
    expect(input.run.returns).toEqual({
      from: '2021-12-01',
      to: '2026-11-30',
      observations: 2,
      warnings: ['a warning'],
    });
    expect(input.run.estimate.shrinkage).toBe(0.2);
    expect(input.recommended).toBe('maxdiv');
  });

  it("recommends the scenario's choice, else the solved candidate with the highest diversification ratio", () => {
    const doc = scenarioDocument();
    expect(chooseRecommended(doc, run.candidates)).toBe('maxdiv');
    delete doc.recommended;
    const best = run.candidates
      .filter((c) => c.status === 'optimal')
      .map(optimal)
      .sort((a, b) => b.metrics.diversificationRatio - a.metrics.diversificationRatio)[0];
    expect(chooseRecommended(doc, run.candidates)).toBe(best.id);
    expect(errorOf(() => chooseRecommended(doc, [])).location.path).toBe('candidates');
  });
});
