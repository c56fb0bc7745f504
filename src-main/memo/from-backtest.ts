import type { BacktestRun } from '../../shared-core/walkforward/run-backtest.js';
import { formatPct } from '../../shared-core/present/format.js';
import type { MemoStability, MemoStress, MemoWalkForward } from './memo-input.js';

/**
 * The memo's walk-forward summary, stability bands and stress table from a `runBacktest` result
 * (shared-core/walkforward/run-backtest.ts): the same figures `holdfast backtest` prints, in the
 * shapes the memo's pages read. The growth curves are thinned to at most `maxPoints` dates
 * (always keeping the first and last) so the chart stays light.
 */
export function memoSectionsFromBacktest(
  run: BacktestRun,
  recommended: string,
  maxPoints = 260,
): { walkForward: MemoWalkForward; stability?: MemoStability; stress?: MemoStress } {
  const s = run.settings;
  const cost = typeof s.costBps === 'number' ? `${s.costBps} bp costs` : 'costs by asset class';
  const window = s.expanding ? 'an expanding window' : `a ${s.estimationWindow}-period trailing window`;
  const rebalance =
    s.rebalance === 'drift'
      ? `rebalancing when a weight drifts ${formatPct(s.driftBand)} from target`
      : `${s.rebalance} rebalancing`;
  const first = run.candidates[0]?.walkForward;
  let growth: MemoWalkForward['growth'];
  if (first && first.dates.length > 1) {
    const n = first.dates.length;
    const step = Math.max(1, Math.ceil(n / maxPoints));
    const idx: number[] = [];
    for (let t = 0; t < n; t += step) idx.push(t);
    if (idx[idx.length - 1] !== n - 1) idx.push(n - 1);
    growth = {
      dates: idx.map((t) => first.dates[t]),
      series: run.candidates.map((c) => ({ candidateId: c.id, values: idx.map((t) => c.walkForward.growth[t]) })),
    };
  }
  const walkForward: MemoWalkForward = {
    from: s.startDate,
    to: s.endDate,
    settings: `${rebalance}, ${cost}, ${window}`,
    rows: run.candidates.map((c) => ({
      candidateId: c.id,
      annualisedReturn: c.metrics.annualisedReturn,
      volatility: c.metrics.volatility,
      sharpe: Number.isFinite(c.metrics.sharpeRatio) ? c.metrics.sharpeRatio : null,
      maxDrawdown: c.metrics.maxDrawdown.depth,
      turnoverPerYear: c.metrics.turnoverPerYear,
    })),
    ...(growth ? { growth } : {}),
  };

  const rc = run.candidates.find((c) => c.id === recommended);
  const st = rc?.stability;
  const stability: MemoStability | undefined = st
    ? {
        method: `${st.method}, ${st.draws - st.failedDraws} of ${st.draws} resamples solved, blocks of ${st.blockLength} periods`,
        quantiles: [0.05, 0.95],
        bands: Object.entries(st.weights).map(([asset, b]) => ({ asset, low: b.p5, high: b.p95 })),
      }
    : undefined;

  const shocks = run.stress.shocks.map((x) => ({
    name: x.name,
    description: `${x.target} ${x.shock < 0 ? 'falls' : 'rises'} ${formatPct(Math.abs(x.shock))}`,
  }));
  // A client reads the universe and the scenario's own group bands; the asset classes as well
  // would double the table (they stay on the scenario page and in `holdfast backtest`). A
  // scenario without group bands shows its classes.
  const banded = run.stress.historical.filter((h) => h.basisKind !== 'asset-class');
  const historical = new Set(banded.map((h) => h.basis)).size > 1 ? banded : run.stress.historical;
  const windows = historical.map((h) => ({
    name: h.name,
    description: `${h.from} to ${h.to}; the basis itself ${formatPct(h.basisReturn)}`,
  }));
  const stress: MemoStress | undefined =
    shocks.length + windows.length > 0
      ? {
          method: `historical windows (the worst month and the largest drawdown of each basis, held in equal weights) replay the prices of the period on today's weights; a shock moves its target and, by ${run.stress.method}, the other assets`,
          shocks: [...windows, ...shocks],
          rows: run.candidates.map((c) => ({
            candidateId: c.id,
            impacts: [
              ...historical.map((h) => h.portfolioReturns[c.id] ?? NaN),
              ...run.stress.shocks.map((x) => x.byCandidate[c.id]?.portfolioReturn ?? NaN),
            ],
          })),
        }
      : undefined;
  return { walkForward, ...(stability ? { stability } : {}), ...(stress ? { stress } : {}) };
}
