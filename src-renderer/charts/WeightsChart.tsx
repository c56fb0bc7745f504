import { DataTable, percentColumn } from '../app/DataTable.js';
import { memo, useMemo } from 'react';
import { formatPercent } from '../scenario/format.js';
import { ChartFigure } from './EChart.js';
import { FONT, INK, INK_SOFT, RULE } from '../../shared-core/present/palette.js';

export interface WeightRow {
  asset: string;
  name: string;
  current: number;
  target: number;
}

/** Horizontal bars sorted by target weight; "now" is an outline, the proposal a solid fill. */
export function sortByTarget<T extends { target: number; current: number; asset: string }>(rows: readonly T[]): T[] {
  return [...rows].sort((a, b) => b.target - a.target || b.current - a.current || a.asset.localeCompare(b.asset));
}

export function weightsFinding(candidate: string, rows: readonly WeightRow[]): string {
  const held = rows.filter((r) => r.target > 5e-4);
  if (held.length === 0) return `${candidate} holds nothing`;
  const top = sortByTarget(rows)[0];
  return `${candidate} holds ${held.length} of ${rows.length} assets; the largest is ${top.asset} at ${formatPercent(top.target, 'en-GB')}`;
}

function barOption(
  rows: readonly { asset: string; outline: number; fill: number }[],
  colour: string,
  outlineName: string,
  fillName: string,
) {
  const categories = rows.map((r) => r.asset).reverse();
  const fill = rows.map((r) => r.fill * 100).reverse();
  const outline = rows.map((r) => r.outline * 100).reverse();
  return {
    animation: false,
    textStyle: { fontFamily: FONT, color: INK },
    grid: { left: 8, right: 24, top: 28, bottom: 28, containLabel: true },
    legend: { top: 0, left: 0, itemWidth: 18, itemHeight: 10, textStyle: { color: INK_SOFT } },
    tooltip: {
      trigger: 'axis',
      axisPointer: { type: 'shadow' },
      valueFormatter: (v: number) => `${v.toFixed(1)}%`,
    },
    xAxis: {
      type: 'value',
      name: 'per cent of the portfolio',
      nameLocation: 'middle',
      nameGap: 22,
      axisLabel: { formatter: '{value}%' },
      splitLine: { lineStyle: { color: RULE } },
    },
    yAxis: { type: 'category', data: categories, axisTick: { show: false }, axisLabel: { fontSize: 11 } },
    series: [
      {
        id: 'fill',
        name: fillName,
        type: 'bar',
        data: fill,
        barWidth: '62%',
        itemStyle: { color: colour },
        z: 2,
      },
      {
        id: 'outline',
        name: outlineName,
        type: 'bar',
        data: outline,
        barWidth: '62%',
        barGap: '-100%',
        itemStyle: { color: 'rgba(0,0,0,0)', borderColor: INK, borderWidth: 1.5 },
        z: 3,
      },
    ],
  };
}

export const WeightsChart = memo(function WeightsChart(props: {
  candidateLabel: string;
  colour: string;
  rows: readonly WeightRow[];
  locale?: string;
  basis: string;
}) {
  const sorted = useMemo(() => sortByTarget(props.rows), [props.rows]);
  const option = useMemo(
    () =>
      barOption(
        sorted.map((r) => ({ asset: r.asset, outline: r.current, fill: r.target })),
        props.colour,
        'current (outline)',
        'proposed (fill)',
      ),
    [sorted, props.colour],
  );
  return (
    <ChartFigure
      testId="weights-chart"
      title={weightsFinding(props.candidateLabel, props.rows)}
      basis={`Weights, per cent of the portfolio: current holdings as outlines, proposed weights filled. ${props.basis}`}
      option={option}
      seriesById
      height={Math.max(220, 18 * sorted.length + 70)}
      table={
        <DataTable
          caption={`Weights of ${props.candidateLabel}, sorted by proposed weight`}
          rows={sorted}
          rowKey={(r) => r.asset}
          empty="No weights."
          columns={[
            {
              key: 'asset',
              head: 'Asset',
              rowHead: true,
              sortBy: (r) => r.asset,
              cell: (r) => (
                <>
                  {r.asset} <span className="faint">{r.name}</span>
                </>
              ),
            },
            percentColumn('current', 'Current', (r: WeightRow) => r.current, props.locale),
            percentColumn('target', 'Proposed', (r: WeightRow) => r.target, props.locale),
            percentColumn('change', 'Change', (r: WeightRow) => r.target - r.current, props.locale),
          ]}
        />
      }
    />
  );
});

export interface RiskRow {
  asset: string;
  name: string;
  weight: number;
  contribution: number;
}

export function riskFinding(candidate: string, rows: readonly RiskRow[]): string {
  const top = [...rows].sort((a, b) => b.contribution - a.contribution)[0];
  if (!top) return `${candidate} has no risk contributions`;
  return `In ${candidate}, ${top.asset} carries the most risk: ${formatPercent(top.contribution, 'en-GB')} of it from ${formatPercent(top.weight, 'en-GB')} of the weight`;
}

/** Risk contributions in the weights chart's order, the weight as an outline beside each. */
export const RiskContributionChart = memo(function RiskContributionChart(props: {
  candidateLabel: string;
  colour: string;
  rows: readonly RiskRow[];
  /** Asset order of the weights chart. */
  order: readonly string[];
  locale?: string;
  basis: string;
}) {
  const ordered = useMemo(() => {
    const byAsset = new Map(props.rows.map((r) => [r.asset, r]));
    return props.order.map((a) => byAsset.get(a)).filter((r): r is RiskRow => r !== undefined);
  }, [props.rows, props.order]);
  const option = useMemo(
    () =>
      barOption(
        ordered.map((r) => ({ asset: r.asset, outline: r.weight, fill: r.contribution })),
        props.colour,
        'weight (outline)',
        'share of risk (fill)',
      ),
    [ordered, props.colour],
  );
  return (
    <ChartFigure
      testId="risk-chart"
      title={riskFinding(props.candidateLabel, props.rows)}
      basis={`Euler risk contributions, per cent of portfolio volatility, in the order of the weights chart; weights as outlines. ${props.basis}`}
      option={option}
      seriesById
      height={Math.max(220, 18 * ordered.length + 70)}
      table={
        <DataTable
          caption={`Risk contributions of ${props.candidateLabel}`}
          rows={ordered}
          rowKey={(r) => r.asset}
          empty="No risk contributions."
          columns={[
            { key: 'asset', head: 'Asset', rowHead: true, sortBy: (r) => r.asset, cell: (r) => r.asset },
            percentColumn('weight', 'Weight', (r: RiskRow) => r.weight, props.locale),
            percentColumn('share', 'Share of risk', (r: RiskRow) => r.contribution, props.locale),
          ]}
        />
      }
    />
  );
});
