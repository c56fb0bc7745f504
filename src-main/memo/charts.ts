import * as echarts from 'echarts';
import type { EChartsOption } from 'echarts';
import { FONT_REGULAR } from './fonts.js';
import { ACCENT, DIVERGING, RULE_SOFT, INK, INK_SOFT, RULE } from '../../shared-core/present/palette.js';

/**
 * The memo's charts as SVG strings, drawn by ECharts' server-side SVG renderer (no browser, no
 * canvas) and placed in the PDF by svg-to-pdfkit. Sizes are in PDF points. Each builder is a pure
 * function of its rows; titles and the finding in words are set by the page, not the chart, so
 * they are real text in the memo. Every chart is disposed, or Node keeps it alive.
 */
export function renderChartSvg(option: EChartsOption, width: number, height: number): string {
  const chart = echarts.init(null, null, { renderer: 'svg', ssr: true, width, height });
  try {
    chart.setOption({
      animation: false,
      textStyle: { fontFamily: FONT_REGULAR, color: INK, fontSize: 8 },
      ...option,
    });
    return chart.renderToSVGString();
  } finally {
    chart.dispose();
  }
}

const axisLabel = { color: INK_SOFT, fontFamily: FONT_REGULAR, fontSize: 8 };
const splitLine = { lineStyle: { color: RULE_SOFT, width: 0.6 } };
const percentLabel = { ...axisLabel, formatter: (v: number) => `${Math.round(v * 10) / 10}%` };

export interface BarRow {
  label: string;
  /** Fractions; null where there is no current figure. */
  current: number | null;
  target: number;
}

/**
 * Horizontal bars, one per asset in the given order (top to bottom): the target as a solid
 * fill, the current figure as an outline over it, so "now" and "proposed" need no legend.
 */
export function pairedBarsOption(rows: readonly BarRow[], fill: string): EChartsOption {
  const hasCurrent = rows.some((r) => r.current !== null);
  const series: EChartsOption['series'] = [
    {
      type: 'bar',
      name: 'target',
      data: rows.map((r) => r.target * 100),
      barWidth: '62%',
      itemStyle: { color: fill },
      z: 2,
    },
  ];
  if (hasCurrent)
    series.push({
      type: 'bar',
      name: 'current',
      data: rows.map((r) => (r.current === null ? 0 : r.current * 100)),
      barWidth: '62%',
      barGap: '-100%',
      itemStyle: { color: 'none', borderColor: INK, borderWidth: 0.9 },
      z: 3,
    });
  return {
    grid: { left: 8, right: 16, top: 8, bottom: 8, containLabel: true },
    xAxis: { type: 'value', axisLabel: percentLabel, splitLine, axisLine: { show: false } },
    yAxis: {
      type: 'category',
      inverse: true,
      data: rows.map((r) => r.label),
      // Every asset named, never every other one (ECharts thins crowded labels by default).
      axisLabel: { ...axisLabel, interval: 0 },
      axisTick: { show: false },
      axisLine: { lineStyle: { color: RULE } },
    },
    series,
  };
}

/**
 * Correlation heat map on a diverging scale fixed at [-1, 1], so white is exactly zero. Labels
 * are in the given (clustered) order; cells carry their value to two decimals when there is room.
 */
export function heatmapOption(
  labels: readonly string[],
  correlation: readonly (readonly number[])[],
  columnLabels: readonly string[] = labels,
): EChartsOption {
  const n = labels.length;
  // Dark cells (|rho| above 0.6) carry white figures so the value stays legible.
  const data: { value: [number, number, number]; label: { color: string } }[] = [];
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++) {
      const v = Math.round(correlation[i][j] * 100) / 100;
      data.push({ value: [j, i, v], label: { color: Math.abs(v) > 0.6 ? '#FFFFFF' : INK } });
    }
  const showValues = n <= 14;
  return {
    grid: { left: 8, right: 56, top: 8, bottom: 8, containLabel: true },
    xAxis: {
      type: 'category',
      data: [...columnLabels],
      position: 'top',
      axisLabel: {
        ...axisLabel,
        fontSize: n > 15 ? 6 : 8,
        rotate: columnLabels.some((l) => l.length > 3) ? 45 : 0,
        interval: 0,
      },
      axisTick: { show: false },
      axisLine: { show: false },
    },
    yAxis: {
      type: 'category',
      data: [...labels],
      inverse: true,
      axisLabel: { ...axisLabel, interval: 0 },
      axisTick: { show: false },
      axisLine: { show: false },
    },
    visualMap: {
      type: 'continuous',
      min: -1,
      max: 1,
      calculable: false,
      orient: 'vertical',
      right: 0,
      top: 'middle',
      itemHeight: 120,
      itemWidth: 10,
      text: ['+1', '\u22121'],
      textStyle: axisLabel,
      inRange: { color: DIVERGING },
    },
    series: [
      {
        type: 'heatmap',
        data,
        label: {
          show: showValues,
          fontFamily: FONT_REGULAR,
          fontSize: n <= 8 ? 7.5 : 6.5,
          color: INK,
          formatter: (p: { value?: unknown }) => {
            const v = (p.value as number[])[2];
            return v.toFixed(2).replace('-', '\u2212');
          },
        },
        itemStyle: { borderColor: '#FFFFFF', borderWidth: 0.5 },
      },
    ],
  };
}

export interface BandRow {
  label: string;
  low: number;
  high: number;
  target: number;
}

/** Stability bands: a pale bar from the low to the high quantile, a dark tick at the target. */
export function bandsOption(rows: readonly BandRow[]): EChartsOption {
  return {
    grid: { left: 8, right: 16, top: 8, bottom: 8, containLabel: true },
    xAxis: { type: 'value', axisLabel: percentLabel, splitLine, axisLine: { show: false } },
    yAxis: {
      type: 'category',
      inverse: true,
      data: rows.map((r) => r.label),
      // Every asset named, never every other one (ECharts thins crowded labels by default).
      axisLabel: { ...axisLabel, interval: 0 },
      axisTick: { show: false },
      axisLine: { lineStyle: { color: RULE } },
    },
    series: [
      {
        type: 'custom',
        name: 'band',
        encode: { x: [1, 2], y: 0 },
        data: rows.map((r, i) => [i, r.low * 100, r.high * 100]),
        renderItem: (_params, api) => {
          const lo = api.coord([api.value(1), api.value(0)]);
          const hi = api.coord([api.value(2), api.value(0)]);
          const h = (api.size?.([0, 1]) as number[])[1] * 0.5;
          return {
            type: 'rect',
            shape: { x: lo[0], y: lo[1] - h / 2, width: Math.max(1, hi[0] - lo[0]), height: h },
            style: { fill: '#A9C7CA', stroke: ACCENT, lineWidth: 0.5 },
          };
        },
      },
      {
        type: 'scatter',
        name: 'target',
        symbol: 'rect',
        symbolSize: [2.2, 12],
        data: rows.map((r, i) => [r.target * 100, i]),
        itemStyle: { color: INK },
        z: 3,
      },
    ],
  };
}

export interface ScatterPoint {
  label: string;
  volatility: number;
  diversificationRatio: number;
  colour: string;
  recommended: boolean;
}

type LabelSide = 'right' | 'left' | 'top' | 'bottom';
interface Box {
  x0: number;
  x1: number;
  y0: number;
  y1: number;
}

const LABEL_SIZE = 7.5;
/** Source Sans 3's average advance is about half the type size; labels are measured with it. */
const labelWidth = (text: string) => text.length * LABEL_SIZE * 0.5;

function labelBox(x: number, y: number, text: string, side: LabelSide): Box {
  const w = labelWidth(text);
  const h = LABEL_SIZE + 2;
  const gap = 7;
  switch (side) {
    case 'right':
      return { x0: x + gap, x1: x + gap + w, y0: y - h / 2, y1: y + h / 2 };
    case 'left':
      return { x0: x - gap - w, x1: x - gap, y0: y - h / 2, y1: y + h / 2 };
    case 'top':
      return { x0: x - w / 2, x1: x + w / 2, y0: y - gap - h, y1: y - gap };
    case 'bottom':
      return { x0: x - w / 2, x1: x + w / 2, y0: y + gap, y1: y + gap + h };
  }
}

const overlaps = (a: Box, b: Box) => a.x0 < b.x1 && b.x0 < a.x1 && a.y0 < b.y1 && b.y0 < a.y1;

/**
 * A side for each point's label so that no two labels, and no label and marker, overlap where a
 * side allows it: greedy, the recommended point first, trying right, left, above, below, and
 * keeping inside the plot. Positions are in the plot's own units (points, y downwards).
 */
export function labelSides(
  points: readonly { x: number; y: number; label: string; first?: boolean }[],
  plot: { width: number; height: number },
): LabelSide[] {
  const order = points.map((_, i) => i).sort((a, b) => Number(!!points[b].first) - Number(!!points[a].first) || a - b);
  const markers: Box[] = points.map((p) => ({ x0: p.x - 5, x1: p.x + 5, y0: p.y - 5, y1: p.y + 5 }));
  const placed: Box[] = [];
  const sides: LabelSide[] = points.map(() => 'right');
  for (const i of order) {
    const p = points[i];
    const inside = (b: Box) => b.x0 >= 0 && b.x1 <= plot.width && b.y0 >= 0 && b.y1 <= plot.height;
    const free = (b: Box) => !placed.some((q) => overlaps(b, q)) && !markers.some((m, k) => k !== i && overlaps(b, m));
    const sidesToTry: LabelSide[] = ['right', 'left', 'top', 'bottom'];
    const side =
      sidesToTry.find((s) => inside(labelBox(p.x, p.y, p.label, s)) && free(labelBox(p.x, p.y, p.label, s))) ??
      sidesToTry.find((s) => free(labelBox(p.x, p.y, p.label, s))) ??
      'right';
    sides[i] = side;
    placed.push(labelBox(p.x, p.y, p.label, side));
  }
  return sides;
}

/**
 * Candidates: volatility (x) against diversification ratio (y), one point each in its colour,
 * labelled on a side where the label collides with no other (ECharts' own overlap handling does
 * not run in its server-side renderer). `width` and `height` are the chart's, in points.
 */
export function candidatesScatterOption(points: readonly ScatterPoint[], width: number, height: number): EChartsOption {
  const vols = points.map((p) => p.volatility * 100);
  const drs = points.map((p) => p.diversificationRatio);
  const pad = (lo: number, hi: number, f: number) => [lo - (hi - lo) * f - 0.05, hi + (hi - lo) * f + 0.05];
  const [x0, x1] = pad(Math.min(...vols), Math.max(...vols), 0.25);
  const [y0, y1] = pad(Math.min(...drs), Math.max(...drs), 0.25);
  const xMin = Math.max(0, Math.floor(x0 * 2) / 2);
  const xMax = Math.ceil(x1 * 2) / 2;
  const yMin = Math.max(1, Math.floor(y0 * 20) / 20);
  const yMax = Math.ceil(y1 * 20) / 20;
  // The plot area, about: the grid's margins and the y axis labels' room (containLabel).
  const plot = { width: width - 8 - 24 - 24, height: height - 16 - 24 - 14 };
  const sides = labelSides(
    points.map((p) => ({
      x: ((p.volatility * 100 - xMin) / (xMax - xMin)) * plot.width,
      y: (1 - (p.diversificationRatio - yMin) / (yMax - yMin)) * plot.height,
      label: p.label,
      first: p.recommended,
    })),
    plot,
  );
  return {
    grid: { left: 8, right: 24, top: 16, bottom: 24, containLabel: true },
    xAxis: {
      type: 'value',
      name: 'volatility, annualised (%)',
      nameLocation: 'middle',
      nameGap: 20,
      nameTextStyle: axisLabel,
      min: xMin,
      max: xMax,
      axisLabel,
      splitLine,
    },
    yAxis: {
      type: 'value',
      name: 'diversification ratio',
      nameTextStyle: axisLabel,
      min: yMin,
      max: yMax,
      axisLabel,
      splitLine,
    },
    series: points.map((p, i) => ({
      type: 'scatter' as const,
      name: p.label,
      symbol: p.recommended ? 'diamond' : 'circle',
      symbolSize: p.recommended ? 11 : 8,
      data: [[p.volatility * 100, p.diversificationRatio]],
      itemStyle: { color: p.colour, borderColor: INK, borderWidth: p.recommended ? 1 : 0.5 },
      label: {
        show: true,
        position: sides[i],
        formatter: p.label,
        fontFamily: FONT_REGULAR,
        fontSize: LABEL_SIZE,
        color: INK,
      },
    })),
  };
}

export interface GrowthSeries {
  label: string;
  colour: string;
  values: readonly number[];
}

/** Walk-forward growth of 1 on a log scale, one line per candidate. */
export function growthOption(dates: readonly string[], series: readonly GrowthSeries[]): EChartsOption {
  const all = series.flatMap((s) => s.values.filter((v) => v > 0));
  const base = Math.max(1.01, Math.round(((Math.max(...all) * 1.03) / (Math.min(...all) * 0.97)) ** 0.2 * 100) / 100);
  const lo = base ** Math.floor(Math.log(Math.min(...all)) / Math.log(base));
  const hi = base ** Math.ceil(Math.log(Math.max(...all)) / Math.log(base));
  return {
    // Room on the right for half of the last date, which sits centred under the last point.
    grid: { left: 8, right: 28, top: 16, bottom: 8, containLabel: true },
    xAxis: {
      type: 'category',
      data: [...dates],
      axisLabel: { ...axisLabel, interval: Math.max(0, Math.floor(dates.length / 6) - 1) },
      axisTick: { show: false },
      axisLine: { lineStyle: { color: RULE } },
    },
    yAxis: {
      type: 'log',
      // ECharts puts log ticks at powers of the base; a base of about the fifth root of the
      // range gives five or so gridlines at equal ratios whatever the range.
      logBase: base,
      min: lo,
      max: hi,
      axisLabel: { ...axisLabel, formatter: (v: number) => v.toFixed(2) },
      splitLine,
    },
    series: series.map((s) => ({
      type: 'line' as const,
      name: s.label,
      data: [...s.values],
      showSymbol: false,
      lineStyle: { color: s.colour, width: 1.2 },
      itemStyle: { color: s.colour },
    })),
  };
}
