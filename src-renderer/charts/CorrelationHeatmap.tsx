import { memo, useMemo } from 'react';
import { formatRatio } from '../scenario/format.js';
import { ChartFigure } from './EChart.js';
import { DIVERGING, FONT, INK } from '../../shared-core/present/palette.js';

/** The most and least correlated pairs, in words. */
export function correlationFinding(assets: readonly string[], correlation: readonly number[]): string {
  const n = assets.length;
  let hi = { v: -Infinity, i: 0, j: 0 };
  let lo = { v: Infinity, i: 0, j: 0 };
  for (let i = 0; i < n; i++)
    for (let j = i + 1; j < n; j++) {
      const v = correlation[i * n + j];
      if (v > hi.v) hi = { v, i, j };
      if (v < lo.v) lo = { v, i, j };
    }
  if (n < 2) return 'One asset: no correlations to show';
  return `Most alike: ${assets[hi.i]} and ${assets[hi.j]} (${formatRatio(hi.v, 'en-GB')}); least: ${assets[lo.i]} and ${assets[lo.j]} (${formatRatio(lo.v, 'en-GB')})`;
}

export const CorrelationHeatmap = memo(function CorrelationHeatmap(props: {
  assets: readonly string[];
  /** N x N row-major, in `assets` order. */
  correlation: readonly number[];
  /** Display order (hierarchical clustering). */
  order: readonly number[];
  estimateLabel: string;
  basis: string;
  locale?: string;
}) {
  const { assets, correlation, order } = props;
  const n = assets.length;
  const labels = useMemo(() => order.map((i) => assets[i]), [assets, order]);
  const option = useMemo(() => {
    const data: [number, number, number][] = [];
    order.forEach((i, x) =>
      order.forEach((j, y) => data.push([x, n - 1 - y, Math.round(correlation[i * n + j] * 1000) / 1000])),
    );
    return {
      animation: false,
      textStyle: { fontFamily: FONT, color: INK },
      grid: { left: 8, right: 70, top: 8, bottom: 8, containLabel: true },
      tooltip: {
        formatter: (p: { value: [number, number, number] }) =>
          `${labels[p.value[0]]} and ${labels[n - 1 - p.value[1]]}: ${p.value[2].toFixed(2)}`,
      },
      xAxis: {
        type: 'category',
        data: labels,
        axisLabel: { rotate: 60, fontSize: 10, interval: 0 },
        axisTick: { show: false },
        splitArea: { show: false },
      },
      yAxis: {
        type: 'category',
        data: [...labels].reverse(),
        axisLabel: { fontSize: 10, interval: 0 },
        axisTick: { show: false },
      },
      visualMap: {
        type: 'continuous',
        min: -1,
        max: 1,
        calculable: false,
        orient: 'vertical',
        right: 0,
        top: 'middle',
        itemHeight: 160,
        text: ['+1', '\u22121'],
        inRange: { color: DIVERGING },
      },
      series: [
        {
          id: 'correlation',
          type: 'heatmap',
          data,
          progressive: 0,
          emphasis: { itemStyle: { borderColor: INK, borderWidth: 1 } },
        },
      ],
    };
  }, [correlation, order, labels, n]);
  return (
    <ChartFigure
      testId="correlation-heatmap"
      title={correlationFinding(assets, correlation)}
      basis={`Correlations of the ${props.estimateLabel} estimate, from \u22121 (blue) through 0 (white) to +1 (red); assets ordered by hierarchical clustering (average linkage) so related assets sit together. ${props.basis}`}
      option={option}
      seriesById
      height={Math.max(320, 16 * n + 110)}
      table={
        <div className="table-scroll">
          <table className="grid matrix">
            <caption>Correlation matrix, clustered order</caption>
            <thead>
              <tr>
                <th scope="col">Asset</th>
                {labels.map((a) => (
                  <th key={a} scope="col" className="num">
                    {a}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {order.map((i) => (
                <tr key={assets[i]}>
                  <th scope="row">{assets[i]}</th>
                  {order.map((j) => (
                    <td key={j} className="num">
                      {formatRatio(correlation[i * n + j], props.locale)}
                    </td>
                  ))}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      }
    />
  );
});
