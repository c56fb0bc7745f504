import { describe, expect, it } from 'vitest';
import { conditionNumber } from '../../../shared-core/linalg/condition.js';
import { effectiveBets } from '../../../shared-core/analytics/risk.js';
import { tridiagonalForm } from '../../../shared-core/linalg/tridiagonal-form.js';
import type { Matrix } from '../../../shared-core/linalg/matrix.js';
import type { PriceTable } from '../../../shared-core/prices/price-table.js';
import { runScenario } from '../../../shared-core/scenario/run-scenario.js';
import { parseScenario } from '../../../shared-core/scenario/schema.js';

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
    const reduced: Matrix[] = [];
    const run = runScenario(parsed.scenario, prices(12, 300), {
      tridiagonalise: (m) => {
        reduced.push(m);
        return tridiagonalForm(m);
      },
    });
    expect(reduced).toHaveLength(2); // two estimators, six candidates
    for (const c of run.candidates) {
      expect(c.status).toBe('optimal');
      const { covariance, assets, estimate } = run.estimates[c.id];
      const w = assets.map((a) => c.weights[a]);
      expect(c.metrics!.effectiveBets).toBeCloseTo(effectiveBets(w, covariance), 12);
      expect(estimate.diagnostics.conditionNumber).toBeCloseTo(conditionNumber(estimate.covariance).value, 8);
    }
  });
});
