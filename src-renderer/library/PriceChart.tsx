import { useMemo, useState } from 'react';
import type { PriceSeries } from '../../shared-core/contract/service-api.js';
import { formatDate, formatSignedPercent } from '../scenario/format.js';
import { EChart } from '../charts/EChart.js';
import type { EChartsOption } from '../charts/echarts-setup.js';
import './price-chart-setup.js';
import { ACCENT, INK, INK_FAINT, INK_SOFT, RULE, RULE_SOFT, SHEET } from '../../shared-core/present/palette.js';

/** Last close of each calendar month: the table behind the chart. */
export function monthEndCloses(series: PriceSeries): { date: string; close: number }[] {
  const out: { date: string; close: number }[] = [];
  series.dates.forEach((d, i) => {
    const last = out[out.length - 1];
    if (last && last.date.slice(0, 7) === d.slice(0, 7)) {
      last.date = d;
      last.close = series.closes[i];
    } else out.push({ date: d, close: series.closes[i] });
  });
  return out;
}

function closeText(value: number): string {
  return value.toLocaleString(undefined, { minimumFractionDigits: 2, maximumFractionDigits: 2 });
}

/** One asset's stored closes over time, with its finding stated above it. */
export function PriceChart({ series }: { series: PriceSeries }) {
  const [logScale, setLogScale] = useState(false);
  const n = series.dates.length;
  const option = useMemo<EChartsOption>(
    () => ({
      animation: false,
      textStyle: { fontFamily: 'DejaVu Sans, sans-serif', color: INK },
      grid: { left: 64, right: 24, top: 16, bottom: 64 },
      tooltip: { trigger: 'axis', valueFormatter: (v: unknown) => closeText(Number(v)) },
      xAxis: {
        type: 'time',
        axisLine: { lineStyle: { color: INK_SOFT } },
        axisLabel: { color: INK_SOFT },
        splitLine: { show: false },
      },
      yAxis: {
        axisLabel: { color: INK_SOFT },
        type: logScale ? 'log' : 'value',
        scale: true,
        // A log axis would otherwise run from decade to decade and flatten the line.
        ...(logScale
          ? {
              min: (v: { min: number }) => Number((v.min * 0.92).toPrecision(2)),
              max: (v: { max: number }) => Number((v.max * 1.08).toPrecision(2)),
              axisLabel: {
                color: INK_SOFT,
                showMinLabel: false,
                formatter: (value: number) => value.toLocaleString(),
              },
            }
          : {}),
        name: series.currency ?? 'price',
        nameTextStyle: { color: INK_SOFT, align: 'right' },
        splitLine: { lineStyle: { color: RULE_SOFT } },
      },
      dataZoom: [
        { type: 'inside' },
        {
          type: 'slider',
          height: 20,
          bottom: 12,
          borderColor: RULE,
          fillerColor: 'rgba(29, 92, 99, 0.12)',
          handleStyle: { color: SHEET, borderColor: ACCENT },
          moveHandleStyle: { color: ACCENT, opacity: 0.35 },
          selectedDataBackground: { lineStyle: { color: ACCENT }, areaStyle: { color: 'rgba(29, 92, 99, 0.18)' } },
          emphasis: { handleStyle: { borderColor: ACCENT }, moveHandleStyle: { color: ACCENT, opacity: 0.6 } },
          textStyle: { color: INK_SOFT },
          dataBackground: { lineStyle: { color: INK_FAINT }, areaStyle: { color: RULE_SOFT } },
          labelFormatter: (value: number) => formatDate(new Date(value).toISOString().slice(0, 10)),
        },
      ],
      series: [
        {
          type: 'line',
          name: series.asset,
          showSymbol: false,
          sampling: 'lttb',
          lineStyle: { width: 1.4, color: ACCENT },
          itemStyle: { color: ACCENT },
          data: series.dates.map((d, i) => [d, series.closes[i]]),
        },
      ],
    }),
    [series, logScale],
  );
  const table = useMemo(() => monthEndCloses(series), [series]);

  if (n === 0)
    return (
      <div className="chart-box">
        <p className="chart-title">{series.asset}: no prices stored yet.</p>
      </div>
    );
  const change = series.closes[n - 1] / series.closes[0] - 1;
  return (
    <figure className="chart-box" style={{ margin: 0 }} aria-label={`Price chart of ${series.asset}`}>
      <div style={{ display: 'flex', justifyContent: 'space-between', gap: '1rem', alignItems: 'baseline' }}>
        <p className="chart-title">
          {series.name && series.name !== series.asset ? `${series.asset} · ${series.name}` : series.asset}:{' '}
          {n.toLocaleString()} closes from {formatDate(series.dates[0])} to {formatDate(series.dates[n - 1])},{' '}
          {formatSignedPercent(change)} over the period
        </p>
        <div className="actions" role="group" aria-label="Price scale">
          <button
            type="button"
            aria-pressed={!logScale}
            onClick={() => setLogScale(false)}
            className={!logScale ? 'primary' : ''}
          >
            Linear
          </button>
          <button
            type="button"
            aria-pressed={logScale}
            onClick={() => setLogScale(true)}
            className={logScale ? 'primary' : ''}
          >
            Logarithmic
          </button>
        </div>
      </div>
      <p className="chart-basis">
        Stored closing prices in {series.currency ?? 'an unset currency'}, as imported; no adjustment. Drag the bar
        below to narrow the dates.
      </p>
      <div data-testid="price-chart">
        <EChart option={option} height={300} label={`Closing prices of ${series.asset} over time`} />
      </div>
      <details>
        <summary>Month-end closes ({table.length})</summary>
        <table className="grid">
          <thead>
            <tr>
              <th scope="col">Month end</th>
              <th scope="col" className="num">
                Close ({series.currency ?? 'unset'})
              </th>
            </tr>
          </thead>
          <tbody>
            {table.map((r) => (
              <tr key={r.date}>
                <td className="tabular">{formatDate(r.date)}</td>
                <td className="num">{closeText(r.close)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </details>
    </figure>
  );
}
