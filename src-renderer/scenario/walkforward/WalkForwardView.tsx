import { memo, useMemo } from 'react';
import type { BacktestRun, CandidateBacktest } from '../../../shared-core/walkforward/run-backtest.js';
import { ChartFigure } from '../../charts/EChart.js';
import { candidateColour, candidateSymbol, FONT, INK, INK_SOFT, RULE } from '../../../shared-core/present/palette.js';
import { formatDate, formatPercent, formatRatio, formatSignedPercent } from '../format.js';
import { drawdowns, thinIndices } from './series.js';

/**
 * Out of sample, side by side: each candidate walked forward (estimated on trailing data only,
 * rebalanced on its schedule, after costs), as growth of 1 on a log scale with the drawdown
 * beneath on the same time axis, turnover at each rebalance, the metrics with the significance of
 * each difference from the reference candidate, and the stress table.
 */
const MAX_POINTS = 700;

export function growthFinding(run: BacktestRun): string {
  const ends = run.candidates.map((c) => ({
    id: c.id,
    end: c.walkForward.growth[c.walkForward.growth.length - 1] ?? 1,
    dd: c.metrics.maxDrawdown.depth,
  }));
  if (ends.length === 0) return 'No candidate was walked forward';
  // One candidate has no "highest": say where it ended and how far it fell.
  if (ends.length === 1)
    return `${ends[0].id}: 1 grew to ${ends[0].end.toFixed(2)}, and fell ${formatPercent(ends[0].dd, 'en-GB')} at worst`;
  const top = [...ends].sort((a, b) => b.end - a.end)[0];
  const calm = [...ends].sort((a, b) => a.dd - b.dd)[0];
  const first = `${top.id} ends highest (1 grew to ${top.end.toFixed(2)})`;
  return calm.id === top.id
    ? `${first} and also fell least (${formatPercent(-calm.dd, 'en-GB')} at worst)`
    : `${first}; ${calm.id} fell least (${formatPercent(-calm.dd, 'en-GB')} at worst)`;
}

function GrowthChart({ run, colourIndex }: { run: BacktestRun; colourIndex: (id: string) => number }) {
  const option = useMemo(() => {
    const series: object[] = [];
    // A log axis does not fit itself to the data: give it the range the curves span.
    let lo = 1;
    let hi = 1;
    for (const c of run.candidates)
      for (const g of c.walkForward.growth) {
        if (g < lo) lo = g;
        if (g > hi) hi = g;
      }
    run.candidates.forEach((c) => {
      const wf = c.walkForward;
      const keep = thinIndices(wf.growth, MAX_POINTS);
      const dd = drawdowns(wf.growth);
      const colour = candidateColour(colourIndex(c.id));
      series.push({
        name: c.id,
        type: 'line',
        showSymbol: false,
        lineStyle: { width: 1.6, color: colour },
        itemStyle: { color: colour },
        data: keep.map((i) => [wf.dates[i], wf.growth[i]]),
      });
      series.push({
        name: c.id,
        type: 'line',
        xAxisIndex: 1,
        yAxisIndex: 1,
        showSymbol: false,
        lineStyle: { width: 1.2, color: colour },
        itemStyle: { color: colour },
        data: thinIndices(dd, MAX_POINTS).map((i) => [wf.dates[i], Math.round(dd[i] * 10000) / 100]),
      });
    });
    return {
      animation: false,
      textStyle: { fontFamily: FONT, color: INK },
      legend: { top: 0, left: 0, textStyle: { color: INK_SOFT } },
      tooltip: { trigger: 'axis' },
      axisPointer: { link: [{ xAxisIndex: 'all' }] },
      grid: [
        { left: 56, right: 20, top: 30, height: '52%' },
        { left: 56, right: 20, top: '70%', bottom: 30 },
      ],
      xAxis: [
        { type: 'time', gridIndex: 0, axisLabel: { show: false } },
        { type: 'time', gridIndex: 1 },
      ],
      yAxis: [
        {
          type: 'log',
          gridIndex: 0,
          name: 'growth of 1 (log scale)',
          nameLocation: 'middle',
          nameGap: 40,
          min: Math.floor(lo * 0.95 * 100) / 100,
          max: Math.ceil(hi * 1.05 * 100) / 100,
          axisLabel: { formatter: (v: number) => v.toFixed(2) },
          splitLine: { lineStyle: { color: RULE } },
        },
        {
          type: 'value',
          gridIndex: 1,
          name: 'drawdown, %',
          nameLocation: 'middle',
          nameGap: 40,
          max: 0,
          axisLabel: { formatter: '{value}%' },
          splitLine: { lineStyle: { color: RULE } },
        },
      ],
      series,
    };
  }, [run, colourIndex]);
  return (
    <ChartFigure
      testId="walkforward-growth"
      title={growthFinding(run)}
      basis={`Growth of 1 invested on ${formatDate(run.settings.startDate)}, after costs, log scale; the fall from each candidate's running peak beneath, on the same dates. Rebalanced ${run.settings.rebalance}, estimated on the ${run.settings.expanding ? 'expanding' : `trailing ${run.settings.estimationWindow}-period`} window${run.settings.windowFromHistory ? ` (chosen from the history: the usual window, at most half of its ${run.settings.historyReturns} returns)` : ''}, costs ${typeof run.settings.costBps === 'number' ? `${run.settings.costBps} bp` : 'by asset class'} of traded value. Past results do not guarantee future ones.`}
      option={option}
      height={420}
      table={<MetricsTable run={run} caption="Growth and drawdown, by candidate" />}
    />
  );
}

function TurnoverChart({ run, colourIndex }: { run: BacktestRun; colourIndex: (id: string) => number }) {
  const option = useMemo(
    () => ({
      animation: false,
      textStyle: { fontFamily: FONT, color: INK },
      legend: { top: 0, left: 0, textStyle: { color: INK_SOFT } },
      tooltip: { trigger: 'item', valueFormatter: (v: number) => `${Number(v).toFixed(1)}%` },
      grid: { left: 56, right: 20, top: 30, bottom: 30 },
      xAxis: { type: 'time' },
      yAxis: {
        type: 'value',
        name: 'turnover, % of the portfolio',
        nameLocation: 'middle',
        nameGap: 40,
        axisLabel: { formatter: '{value}%' },
        splitLine: { lineStyle: { color: RULE } },
      },
      series: run.candidates.map((c) => ({
        name: c.id,
        type: 'scatter',
        symbol: candidateSymbol(colourIndex(c.id)),
        symbolSize: 6,
        itemStyle: { color: candidateColour(colourIndex(c.id)), borderColor: INK, borderWidth: 0.5 },
        data: c.walkForward.rebalances.slice(1).map((r) => [r.date, Math.round(r.turnover * 1000) / 10]),
      })),
    }),
    [run, colourIndex],
  );
  const busiest = [...run.candidates].sort((a, b) => b.metrics.turnoverPerYear - a.metrics.turnoverPerYear)[0];
  return (
    <ChartFigure
      testId="walkforward-turnover"
      title={
        busiest
          ? `${busiest.id} trades most: ${formatPercent(busiest.metrics.turnoverPerYear, 'en-GB')} of the portfolio a year`
          : 'No rebalances'
      }
      basis="Turnover at each rebalance after the first (sum of |new weight − drifted weight|), per cent of the portfolio."
      option={option}
      height={260}
      table={
        <table className="grid">
          <caption>Turnover per year and cost drag, by candidate</caption>
          <thead>
            <tr>
              <th scope="col">Candidate</th>
              <th scope="col" className="num">
                Rebalances
              </th>
              <th scope="col" className="num">
                Turnover a year
              </th>
              <th scope="col" className="num">
                Cost drag a year
              </th>
            </tr>
          </thead>
          <tbody>
            {run.candidates.map((c) => (
              <tr key={c.id}>
                <th scope="row">{c.id}</th>
                <td className="num">{c.metrics.rebalanceCount}</td>
                <td className="num">{formatPercent(c.metrics.turnoverPerYear)}</td>
                <td className="num">{formatPercent(c.metrics.costDragPerYear, undefined, 2)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      }
    />
  );
}

function interval(d: { difference: number; lower: number; upper: number; pValue: number }, percent: boolean): string {
  const f = (v: number) => (percent ? formatSignedPercent(v) : (v >= 0 ? '+' : '\u2212') + formatRatio(Math.abs(v)));
  return `${f(d.difference)} [${f(d.lower)}, ${f(d.upper)}], p = ${d.pValue.toFixed(2)}`;
}

function MetricsTable({ run, caption, testId }: { run: BacktestRun; caption: string; testId?: string }) {
  const rows: { label: string; value: (c: CandidateBacktest) => string }[] = [
    { label: 'Annualised return', value: (c) => formatPercent(c.metrics.annualisedReturn) },
    { label: 'Volatility, annualised', value: (c) => formatPercent(c.metrics.volatility) },
    { label: 'Sharpe ratio', value: (c) => formatRatio(c.metrics.sharpeRatio) },
    {
      label: 'Maximum drawdown',
      value: (c) =>
        `${formatPercent(-c.metrics.maxDrawdown.depth)} (${formatDate(c.metrics.maxDrawdown.peakDate)} to ${formatDate(c.metrics.maxDrawdown.troughDate)})`,
    },
    {
      label: 'Realised diversification ratio, average',
      value: (c) => formatRatio(c.metrics.averageRealisedDiversificationRatio),
    },
    {
      label: 'Realised / forecast volatility, median (10%-90%)',
      value: (c) =>
        c.metrics.volatilityRatio
          ? `${formatRatio(c.metrics.volatilityRatio.median)} (${formatRatio(c.metrics.volatilityRatio.p10)}-${formatRatio(c.metrics.volatilityRatio.p90)})`
          : '\u2013',
    },
    { label: 'Turnover a year', value: (c) => formatPercent(c.metrics.turnoverPerYear) },
    { label: 'Costs paid', value: (c) => formatPercent(c.metrics.costsPaid, undefined, 2) },
    {
      label: 'Rebalances (not solved)',
      value: (c) => `${c.metrics.rebalanceCount} (${c.metrics.failedRebalances})`,
    },
  ];
  const against = new Map(run.comparisons.map((k) => [k.a === run.reference ? k.b : k.a, k]));
  return (
    <table className="grid walkforward-metrics" data-testid={testId}>
      <caption>{caption}</caption>
      <thead>
        <tr>
          <th scope="col">Out of sample</th>
          {run.candidates.map((c) => (
            <th key={c.id} scope="col" className="num">
              {c.id}
              {c.id === run.reference && run.candidates.length > 1 ? ' (reference)' : ''}
            </th>
          ))}
        </tr>
      </thead>
      <tbody>
        {rows.map((r) => (
          <tr key={r.label}>
            <th scope="row">{r.label}</th>
            {run.candidates.map((c) => (
              <td key={c.id} className="num">
                {r.value(c)}
              </td>
            ))}
          </tr>
        ))}
        {/* Differences from the reference need a second candidate; one alone shows none. */}
        {run.comparisons.length > 0 ? (
          <>
            <DifferenceRow
              label="Sharpe ratio minus the reference’s [95% interval]"
              run={run}
              against={against}
              metric="sharpeRatio"
            />
            <tr>
              <th scope="row" title={run.comparisons.find((k) => k.hacTest)?.hacTest?.method}>
                Same Sharpe ratio as the reference? p-value robust to volatility clustering (Ledoit-Wolf)
              </th>
              {run.candidates.map((c) => {
                const hac = against.get(c.id)?.hacTest;
                return (
                  <td key={c.id} className="num" data-hac-p={hac ? hac.pValue : undefined}>
                    {hac ? hac.pValue.toFixed(3) : '\u2013'}
                  </td>
                );
              })}
            </tr>
            <DifferenceRow
              label="Volatility minus the reference’s [95% interval]"
              run={run}
              against={against}
              metric="volatility"
            />
          </>
        ) : null}
      </tbody>
    </table>
  );
}

/** One difference from the reference per candidate, told from that candidate's side. */
function DifferenceRow(props: {
  label: string;
  run: BacktestRun;
  /** Each other candidate's comparison with the reference, by that candidate's id. */
  against: ReadonlyMap<string, BacktestRun['comparisons'][number]>;
  metric: 'sharpeRatio' | 'volatility';
}) {
  const { run, metric } = props;
  return (
    <tr>
      <th scope="row">{props.label}</th>
      {run.candidates.map((c) => {
        const k = props.against.get(c.id);
        const d = k?.[metric];
        return (
          <td key={c.id} className="num">
            {k && d
              ? interval(
                  k.a === c.id ? d : { ...d, difference: -d.difference, lower: -d.upper, upper: -d.lower },
                  metric === 'volatility',
                )
              : '\u2013'}
          </td>
        );
      })}
    </tr>
  );
}

function StressTable({ run }: { run: BacktestRun }) {
  const { historical, shocks } = run.stress;
  return (
    <div className="table-scroll">
      <table className="grid" data-testid="stress-table">
        <caption>
          Stress: the worst periods in the data replayed on today’s weights, and shocks carried through each estimate (
          {run.stress.method})
        </caption>
        <thead>
          <tr>
            <th scope="col">Scenario</th>
            <th scope="col">Window or shock</th>
            <th scope="col" className="num">
              Basis
            </th>
            {run.candidates.map((c) => (
              <th key={c.id} scope="col" className="num">
                {c.id}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {historical.map((h, i) => (
            <tr key={`h${i}`}>
              <th scope="row">{h.name}</th>
              <td>
                {formatDate(h.from)} to {formatDate(h.to)}
              </td>
              <td className="num">{formatSignedPercent(h.basisReturn)}</td>
              {run.candidates.map((c) => (
                <td key={c.id} className="num">
                  {formatSignedPercent(h.portfolioReturns[c.id])}
                </td>
              ))}
            </tr>
          ))}
          {shocks.map((s, i) => (
            <tr key={`s${i}`}>
              <th scope="row">{s.name}</th>
              <td>
                {s.target} {formatSignedPercent(s.shock)}
              </td>
              <td className="num">–</td>
              {run.candidates.map((c) => (
                <td key={c.id} className="num">
                  {formatSignedPercent(s.byCandidate[c.id]?.portfolioReturn)}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

export const WalkForwardView = memo(function WalkForwardView(props: {
  run: BacktestRun;
  colourIndex: (id: string) => number;
}) {
  const { run } = props;
  return (
    <div className="walkforward" data-testid="walkforward-view">
      {run.warnings.length > 0 ? (
        <div className="note warning" role="note">
          {run.warnings.join(' ')}
        </div>
      ) : null}
      <GrowthChart run={run} colourIndex={props.colourIndex} />
      <div className="table-scroll">
        <MetricsTable
          testId="walkforward-metrics"
          run={run}
          caption={`Walk-forward figures from ${formatDate(run.settings.startDate)} to ${formatDate(run.settings.endDate)}; differences by ${run.comparisons[0]?.method ?? 'bootstrap'}`}
        />
      </div>
      <TurnoverChart run={run} colourIndex={props.colourIndex} />
      <StressTable run={run} />
    </div>
  );
});
