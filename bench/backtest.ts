import type { PriceTable } from '../shared-core/prices/price-table.js';
import { parseScenario, type Scenario } from '../shared-core/scenario/schema.js';
import { seededRng } from '../shared-core/stability/rng.js';
import { estimateAndSolve } from '../shared-core/walkforward/estimate-and-solve.js';
import { runBacktest, type EstimateAndSolveFn } from '../shared-core/walkforward/run-backtest.js';
import { median, type BenchSuite } from './harness.js';

/**
 * Issue 7's speed target: 60 assets, 12 years of daily prices, monthly rebalancing (about 144
 * rebalances), 6 candidates (3 estimators x 2 objectives), in at most 3 s in-process with
 * warm-started solves. Prices are invented: a seeded three-factor lognormal model.
 */
const ASSETS = 60;
const YEARS = 12;
const ROWS = YEARS * 252 + 250;

function syntheticPrices(seed: number): PriceTable {
  const rng = seededRng(seed);
  const z = () => Math.sqrt(-2 * Math.log(1 - rng.next())) * Math.cos(2 * Math.PI * rng.next());
  const ids = Array.from({ length: ASSETS }, (_, i) => `S${String(i + 1).padStart(2, '0')}`);
  const load = ids.map((_, i) => [0.4 + (0.8 * ((i * 13) % 7)) / 7, ((i % 3) - 1) * 0.5, i % 5 === 0 ? 0.8 : 0.1]);
  const idio = ids.map((_, i) => 0.004 + 0.01 * (((i * 17) % 11) / 11));
  const closes = ids.map(() => new Float64Array(ROWS));
  const level = ids.map(() => 100);
  const dates: string[] = [];
  const day = new Date('2012-01-02T00:00:00Z');
  for (let t = 0; t < ROWS; t++) {
    while (day.getUTCDay() === 0 || day.getUTCDay() === 6) day.setUTCDate(day.getUTCDate() + 1);
    dates.push(day.toISOString().slice(0, 10));
    day.setUTCDate(day.getUTCDate() + 1);
    const f = [0.009 * z(), 0.005 * z(), 0.004 * z()];
    for (let i = 0; i < ASSETS; i++) {
      if (t > 0)
        level[i] *= Math.exp(0.0002 + load[i][0] * f[0] + load[i][1] * f[1] + load[i][2] * f[2] + idio[i] * z());
      closes[i][t] = level[i];
    }
  }
  return { dates, assets: ids, closes };
}

function benchScenario(): Scenario {
  const estimators = [{ method: 'ledoit-wolf' }, { method: 'ewma' }, { method: 'oas' }];
  const objectives = [{ method: 'max-diversification' }, { method: 'equal-risk-contribution' }];
  const parsed = parseScenario({
    format: 'holdfast-scenario@1',
    name: 'Backtest bench',
    baseCurrency: 'EUR',
    constraints: { longOnly: true, weightBounds: { default: [0, 0.1] } },
    candidates: estimators.flatMap((e) =>
      objectives.map((o) => ({ id: `${o.method}-${e.method}`, estimator: e, objective: o })),
    ),
    backtest: { estimationWindow: 250, rebalance: 'monthly', costBps: 10 },
  });
  if (!parsed.ok) throw new Error('bench scenario invalid');
  return parsed.scenario;
}

export const backtestSuite: BenchSuite = {
  name: 'backtest',
  async run() {
    const prices = syntheticPrices(2024);
    const scenario = benchScenario();
    let solves = 0;
    let solveMs = 0;
    const counted: EstimateAndSolveFn = (r) => {
      solves++;
      const t = performance.now();
      const out = estimateAndSolve(r);
      solveMs += performance.now() - t;
      return out;
    };
    const once = async () => {
      solves = 0;
      solveMs = 0;
      const t0 = performance.now();
      const run = await runBacktest(scenario, prices, { estimateAndSolve: counted, comparisonDraws: 1000 });
      return { ms: performance.now() - t0, solveMs, run };
    };
    const first = await once();
    const times: number[] = [];
    const inSolve: number[] = [];
    for (let k = 0; k < 3; k++) {
      const r = await once();
      times.push(r.ms);
      inSolve.push(r.solveMs);
    }
    const rebalances = first.run.candidates[0].walkForward.rebalances.length;
    const failed = first.run.candidates.reduce((s, c) => s + c.metrics.failedRebalances, 0);
    return [
      {
        label: `walk-forward ${ASSETS} assets, ${YEARS} years daily, monthly (${rebalances} rebalances), 6 candidates`,
        medianMs: median(times),
        targetMs: 3000,
        notes: `${median(inSolve).toFixed(0)} ms of it in ${solves} estimate-and-solve calls (estimators + solveCandidate), ${failed} failed rebalances; includes metrics, 5 comparisons x 1000 bootstrap draws and the stress table`,
      },
    ];
  },
};
