import { describe, expect, it } from 'vitest';
import { conditionNumber } from '../../../shared-core/linalg/condition.js';
import { effectiveBets } from '../../../shared-core/analytics/risk.js';
import type { PriceTable } from '../../../shared-core/prices/price-table.js';
import { estimateCovariance } from '../../../shared-core/estimators/registry.js';
import { createRunCache } from '../../../shared-core/run/run-cache.js';
import { runScenario } from '../../../shared-core/run/run-scenario.js';
import { parseScenario } from '../../../shared-core/scenario/schema.js';
import { optimal } from '../../support/candidate-status.js';

/** Seeded lognormal prices with one common factor (a Park and Miller 1988 stream). */
function prices(n: number, days: number): PriceTable {
  let s = 5;
  const next = () => (s = (s * 16807) % 2147483647) / 2147483647 - 0.5;
  const dates: string[] = [];
  const start = Date.UTC(2021, 0, 4);
  for (let t = 0; t < days; t++) dates.push(new Date(start + t * 86_400_000).toISOString().slice(0, 10));
  const closes = Array.from({ length: n }, () => new Float64Array(days));
  const level = new Float64Array(n).fill(100);
  for (let t = 0; t < days; t++) {
    const f = next() * 0.02;
    for (let i = 0; i < n; i++) {
      if (t > 0) level[i] *= Math.exp((0.5 + i / n) * f + 0.01 * next());
      closes[i][t] = level[i];
    }
  }
  return { dates, assets: Array.from({ length: n }, (_, i) => `A${i + 1}`), closes };
}

describe('runScenario: one tridiagonal reduction per estimate', () => {
  const parsed = parseScenario({
    format: 'holdfast-scenario@1',
    name: 'Reductions',
    baseCurrency: 'EUR',
    returns: { frequency: 'daily', method: 'log' },
    constraints: { longOnly: true, weightBounds: { default: [0, 0.25] } },
    candidates: ['ledoit-wolf', 'oas'].flatMap((e) =>
      ['max-diversification', 'min-variance', 'equal-risk-contribution'].map((o) => ({
        id: `${o}-${e}`,
        estimator: { method: e },
        objective: { method: o },
      })),
    ),
  });
  if (!parsed.ok) throw new Error(parsed.errors[0].message);

  it('serves the exact condition number and every candidate’s effective bets, with the figures of the stand-alone functions', () => {
    const cache = createRunCache();
    const run = runScenario(parsed.scenario, prices(12, 300), { cache });
    expect(cache.forms.size).toBe(2); // two estimators, six candidates
    for (const c of run.candidates.map(optimal)) {
      const { covariance, assets, estimate } = run.estimates[c.id];
      const w = assets.map((a) => c.weights[a]);
      expect(c.metrics.effectiveBets).toBeCloseTo(effectiveBets(w, covariance), 12);
      expect(estimate.diagnostics.conditionNumber).toBeCloseTo(conditionNumber(estimate.covariance).value, 8);
    }
  });
});

describe('runScenario: one cross product of the de-meaned returns for every estimator built on it', () => {
  it('gives each estimate bit for bit as the estimator alone computes it', () => {
    const methods = ['sample', 'ledoit-wolf', 'oas', 'denoised', 'nonlinear', 'ewma'] as const;
    const parsed = parseScenario({
      format: 'holdfast-scenario@1',
      name: 'Shared moments',
      baseCurrency: 'EUR',
      constraints: { longOnly: true },
      candidates: methods.map((m) => ({ id: m, estimator: { method: m }, objective: { method: 'min-variance' } })),
    });
    if (!parsed.ok) throw new Error(parsed.errors[0].message);
    const run = runScenario(parsed.scenario, prices(15, 200));
    for (const m of methods) {
      const alone = estimateCovariance(run.returns.returns, { method: m }, { frequency: run.returns.frequency });
      expect(Array.from(run.estimates[m].estimate.covariance.data)).toEqual(Array.from(alone.covariance.data));
    }
  });
});

describe('runScenario with a run cache (the editor’s live recompute)', () => {
  const parsed = parseScenario({
    format: 'holdfast-scenario@1',
    name: 'Cache',
    baseCurrency: 'EUR',
    returns: { frequency: 'daily', method: 'log' },
    constraints: { longOnly: true, weightBounds: { default: [0, 0.3] } },
    candidates: [
      { id: 'md', estimator: { method: 'ledoit-wolf' }, objective: { method: 'max-diversification' } },
      { id: 'erc', estimator: { method: 'ewma' }, objective: { method: 'equal-risk-contribution' } },
    ],
  });
  if (!parsed.ok) throw new Error(parsed.errors[0].message);
  const scenario = parsed.scenario;
  const copy = (t: PriceTable): PriceTable => ({ ...t, dates: [...t.dates], closes: t.closes.map((c) => c.slice()) });
  const sameWeights = (a: ReturnType<typeof runScenario>, b: ReturnType<typeof runScenario>) =>
    a.candidates.map(optimal).forEach((c, k) => {
      for (const [asset, w] of Object.entries(c.weights))
        expect(w).toBeCloseTo(optimal(b.candidates[k]).weights[asset], 12);
    });

  it('reuses the returns and estimates while their inputs are unchanged, even for a copied price table, and answers as a run without it', () => {
    const table = prices(10, 260);
    const cache = createRunCache();
    const first = runScenario(scenario, table, { cache });
    const again = runScenario(scenario, copy(table), { cache });
    expect(again.returns).toBe(first.returns);
    expect(again.estimates.md.estimate).toBe(first.estimates.md.estimate);
    const capped = {
      ...scenario,
      constraints: { ...scenario.constraints, weightBounds: { default: [0, 0.2] as [number, number] } },
    };
    const edited = runScenario(capped, table, { cache });
    expect(edited.returns).toBe(first.returns);
    const cold = runScenario(capped, table);
    sameWeights(edited, cold);
    edited.candidates.forEach((c, k) =>
      expect(optimal(c).metrics.effectiveBets).toBeCloseTo(optimal(cold.candidates[k]).metrics.effectiveBets, 12),
    );
  });

  it('builds afresh when a price, the window or the frequency changes', () => {
    const table = prices(10, 260);
    const cache = createRunCache();
    const first = runScenario(scenario, table, { cache });
    const moved = copy(table);
    (moved.closes[3] as Float64Array)[100] *= 1.01;
    const afterPrice = runScenario(scenario, moved, { cache });
    expect(afterPrice.returns).not.toBe(first.returns);
    sameWeights(afterPrice, runScenario(scenario, moved));
    const windowed = { ...scenario, window: { from: '2021-03-01' } };
    const afterWindow = runScenario(windowed, moved, { cache });
    expect(afterWindow.returns).not.toBe(afterPrice.returns);
    expect(afterWindow.returns.dates[0] >= '2021-03-01').toBe(true);
    const weekly = { ...scenario, returns: { ...scenario.returns, frequency: 'weekly' as const } };
    expect(runScenario(weekly, moved, { cache }).returns.frequency).toBe('weekly');
  });

  it('keeps only the estimates the last run used (a half-life typed digit by digit leaves nothing behind)', () => {
    const table = prices(10, 260);
    const cache = createRunCache();
    for (const halfLife of [1, 12, 126, 30])
      runScenario(
        {
          ...scenario,
          candidates: [
            { ...scenario.candidates[0] },
            { ...scenario.candidates[1], estimator: { method: 'ewma', halfLife } },
          ],
        },
        table,
        { cache },
      );
    expect(cache.estimates.size).toBe(2);
    expect(cache.forms.size).toBe(2);
    expect([...cache.estimates.keys()].some((k) => k.includes('"halfLife":30'))).toBe(true);
  });
});
