import { memo, useMemo } from 'react';
import type { EstimateView } from '../worker/comparison.js';
import { formatPercent, formatRatio, formatSignedPercent } from '../scenario/format.js';
import { ChartFigure } from './EChart.js';
import { ESTIMATE_COLOURS, FONT, INK, INK_SOFT, RULE } from '../../shared-core/present/palette.js';

/** Greys and marks for estimates (candidate colours belong to candidates, not estimators). */
const ESTIMATE_STYLES = [
  { colour: ESTIMATE_COLOURS[0], symbol: 'circle' },
  { colour: ESTIMATE_COLOURS[1], symbol: 'triangle' },
  { colour: ESTIMATE_COLOURS[2], symbol: 'rect' },
  { colour: ESTIMATE_COLOURS[3], symbol: 'diamond' },
  { colour: ESTIMATE_COLOURS[4], symbol: 'pin' },
];

export function differenceFinding(estimates: readonly EstimateView[]): string {
  const others = estimates.filter((e) => e.spec.method !== 'sample');
  if (others.length === 0) return 'Only the sample estimate is in use, so there is nothing to compare it with';
  const vol = [...others].sort((a, b) => b.distance.meanVolatilityChange - a.distance.meanVolatilityChange)[0];
  const cor = [...others].sort((a, b) => b.distance.meanCorrelationChange - a.distance.meanCorrelationChange)[0];
  const volText = `${vol.label} moves volatilities furthest from the sample (by ${formatPercent(vol.distance.meanVolatilityChange, 'en-GB')} on average)`;
  const corText = `${cor.label} moves correlations most (by ${formatRatio(cor.distance.meanCorrelationChange, 'en-GB')} on average)`;
  return vol.key === cor.key
    ? `${volText} and its correlations most (by ${formatRatio(cor.distance.meanCorrelationChange, 'en-GB')})`
    : `${volText}; ${corText}`;
}

/** Each estimate's volatility per asset against the sample's, as a per cent change. */
export const EstimateDifferenceChart = memo(function EstimateDifferenceChart(props: {
  assets: readonly string[];
  estimates: readonly EstimateView[];
  basis: string;
  locale?: string;
}) {
  const { assets, estimates } = props;
  const shown = useMemo(() => estimates.filter((e) => e.spec.method !== 'sample'), [estimates]);
  const option = useMemo(
    () => ({
      animation: false,
      textStyle: { fontFamily: FONT, color: INK },
      grid: { left: 8, right: 24, top: 56, bottom: 60, containLabel: true },
      legend: { top: 0, left: 0, textStyle: { color: INK_SOFT } },
      tooltip: { trigger: 'axis', valueFormatter: (v: number) => `\u00d7${v.toFixed(2)}` },
      xAxis: {
        type: 'category',
        data: [...assets],
        axisLabel: { rotate: 60, fontSize: 10, interval: 0 },
        axisTick: { show: false },
      },
      // A ratio reads symmetrically on a log axis: x2 and x0.5 sit equally far from x1.
      yAxis: {
        type: 'log',
        logBase: 2,
        name: 'volatility / sample volatility',
        nameLocation: 'middle',
        nameGap: 52,
        axisLabel: { formatter: (v: number) => `\u00d7${Number(v.toPrecision(3))}` },
        splitLine: { lineStyle: { color: RULE } },
      },
      series: shown.map((e, k) => ({
        id: e.key,
        name: e.label,
        type: 'line',
        lineStyle: { width: 0 },
        symbol: ESTIMATE_STYLES[k % ESTIMATE_STYLES.length].symbol,
        symbolSize: 9,
        itemStyle: { color: ESTIMATE_STYLES[k % ESTIMATE_STYLES.length].colour },
        data: e.distance.volatilityRatio.map((r) => Math.round(r * 1000) / 1000),
        markLine:
          k === 0
            ? {
                silent: true,
                symbol: 'none',
                lineStyle: { color: INK, type: 'solid', width: 1 },
                data: [{ yAxis: 1 }],
                label: { show: false },
              }
            : undefined,
      })),
    }),
    [assets, shown],
  );
  return (
    <ChartFigure
      testId="estimate-difference"
      title={differenceFinding(estimates)}
      basis={`Per asset, each estimate's annualised volatility as a multiple of the sample estimate's on the same returns (\u00d71 = the same; log scale); the table adds how far correlations move. ${props.basis}`}
      option={option}
      seriesById
      height={300}
      table={
        <table className="grid">
          <caption>Distance of each estimate from the sample covariance</caption>
          <thead>
            <tr>
              <th scope="col">Estimate</th>
              <th scope="col" className="num">
                Mean volatility change
              </th>
              <th scope="col" className="num">
                Mean correlation change
              </th>
              <th scope="col">Pair that moves most</th>
              <th scope="col" className="num">
                Shrinkage
              </th>
            </tr>
          </thead>
          <tbody>
            {estimates.map((e) => {
              const big = e.distance.largestCorrelationChange;
              return (
                <tr key={e.key}>
                  <th scope="row">{e.label}</th>
                  <td className="num">{formatPercent(e.distance.meanVolatilityChange, props.locale)}</td>
                  <td className="num">{formatRatio(e.distance.meanCorrelationChange, props.locale)}</td>
                  <td>
                    {big && e.spec.method !== 'sample'
                      ? `${assets[big.i]} / ${assets[big.j]}: ${formatRatio(big.sample, props.locale)} \u2192 ${formatRatio(big.estimate, props.locale)}`
                      : '\u2013'}
                  </td>
                  <td className="num">{e.shrinkage === null ? '\u2013' : formatPercent(e.shrinkage, props.locale)}</td>
                </tr>
              );
            })}
          </tbody>
          <tbody>
            {assets.map((a, i) => (
              <tr key={a}>
                <th scope="row">{a}</th>
                <td colSpan={4}>
                  {shown
                    .map((e) => `${e.label} ${formatSignedPercent(e.distance.volatilityRatio[i] - 1, props.locale)}`)
                    .join('; ')}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      }
    />
  );
});
