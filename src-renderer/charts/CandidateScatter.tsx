import { DataTable, percentColumn } from '../app/DataTable.js';
import { memo, useMemo } from 'react';
import { formatPercent, formatRatio } from '../scenario/format.js';
import { ChartFigure } from './EChart.js';
import { FONT, INK, RULE } from '../../shared-core/present/palette.js';

export interface ScatterPoint {
  id: string;
  label: string;
  colour: string;
  symbol: string;
  volatility: number;
  diversificationRatio: number;
}

export function scatterFinding(points: readonly ScatterPoint[]): string {
  if (points.length === 0) return 'No candidate solved';
  const best = [...points].sort((a, b) => b.diversificationRatio - a.diversificationRatio)[0];
  const calm = [...points].sort((a, b) => a.volatility - b.volatility)[0];
  const first = `${best.id} diversifies most (ratio ${formatRatio(best.diversificationRatio, 'en-GB')} at ${formatPercent(best.volatility, 'en-GB')} volatility)`;
  return calm.id === best.id
    ? `${first} and is also the least volatile`
    : `${first}; ${calm.id} is the least volatile (${formatPercent(calm.volatility, 'en-GB')})`;
}

/** Volatility across, diversification ratio up: one point per candidate, in its colour and mark. */
export const CandidateScatter = memo(function CandidateScatter(props: {
  points: readonly ScatterPoint[];
  basis: string;
  locale?: string;
}) {
  const option = useMemo(
    () => ({
      animation: false,
      textStyle: { fontFamily: FONT, color: INK },
      grid: { left: 12, right: 96, top: 34, bottom: 36, containLabel: true },
      tooltip: {
        formatter: (p: { data: { name: string; value: [number, number] } }) =>
          `${p.data.name}: volatility ${p.data.value[0].toFixed(1)}%, diversification ratio ${p.data.value[1].toFixed(2)}`,
      },
      xAxis: {
        type: 'value',
        name: 'volatility, per cent a year',
        nameLocation: 'middle',
        nameGap: 26,
        // Room around the outermost points, so a label or a mark never sits on an axis.
        min: (v: { min: number; max: number }) => Number((v.min - Math.max(0.1, (v.max - v.min) * 0.12)).toFixed(2)),
        max: (v: { min: number; max: number }) => Number((v.max + Math.max(0.1, (v.max - v.min) * 0.12)).toFixed(2)),
        axisLabel: { formatter: '{value}%', showMinLabel: false, showMaxLabel: false },
        splitLine: { lineStyle: { color: RULE } },
      },
      yAxis: {
        type: 'value',
        name: 'diversification ratio',
        nameLocation: 'end',
        nameTextStyle: { align: 'left' },
        axisLabel: { showMinLabel: false, showMaxLabel: false },
        min: (v: { min: number; max: number }) => Number((v.min - Math.max(0.02, (v.max - v.min) * 0.12)).toFixed(2)),
        max: (v: { min: number; max: number }) => Number((v.max + Math.max(0.02, (v.max - v.min) * 0.12)).toFixed(2)),
        splitLine: { lineStyle: { color: RULE } },
      },
      series: props.points.map((p) => ({
        id: p.id,
        name: p.id,
        type: 'scatter',
        symbol: p.symbol,
        symbolSize: 14,
        itemStyle: { color: p.colour, borderColor: INK, borderWidth: 1 },
        label: { show: true, position: 'right', formatter: p.id, color: INK, fontSize: 11 },
        data: [{ name: p.label, value: [p.volatility * 100, p.diversificationRatio] }],
      })),
    }),
    [props.points],
  );
  return (
    <ChartFigure
      testId="candidate-scatter"
      title={scatterFinding(props.points)}
      basis={`Each candidate's annualised volatility against its diversification ratio (higher is more diversified), each estimated with its own risk estimate. ${props.basis}`}
      option={option}
      seriesById
      height={300}
      table={
        <DataTable
          caption="Volatility and diversification ratio by candidate"
          rows={props.points}
          rowKey={(p) => p.id}
          empty="No candidate has figures yet."
          columns={[
            {
              key: 'candidate',
              head: 'Candidate',
              rowHead: true,
              cell: (p) => (
                <>
                  {p.id} <span className="faint">{p.label}</span>
                </>
              ),
            },
            percentColumn('vol', 'Volatility', (p: ScatterPoint) => p.volatility, props.locale),
            {
              key: 'dr',
              head: 'Diversification ratio',
              num: true,
              sortBy: (p) => p.diversificationRatio,
              cell: (p) => formatRatio(p.diversificationRatio, props.locale),
            },
          ]}
        />
      }
    />
  );
});
