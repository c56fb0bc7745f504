import { useEffect, useRef, type ReactNode } from 'react';
import { echarts, type EChartsOption } from './echarts-setup.js';

/**
 * One ECharts canvas that follows its option and its box size. The canvas is a picture for the
 * eye: the figure around it carries the title, the units and the data table for everyone else.
 */
export function EChart({ option, height, label }: { option: EChartsOption; height: number; label: string }) {
  const box = useRef<HTMLDivElement>(null);
  const chart = useRef<ReturnType<typeof echarts.init> | null>(null);
  useEffect(() => {
    if (!box.current) return;
    const instance = echarts.init(box.current, undefined, { renderer: 'canvas' });
    chart.current = instance;
    const observer = new ResizeObserver(() => instance.resize());
    observer.observe(box.current);
    return () => {
      observer.disconnect();
      instance.dispose();
      chart.current = null;
    };
  }, []);
  useEffect(() => {
    chart.current?.setOption(option, { notMerge: true, lazyUpdate: true });
  }, [option]);
  return <div ref={box} className="echart" style={{ height }} role="img" aria-label={label} />;
}

/**
 * A chart as the design notes ask: a title that states the finding, the basis and units, the
 * picture, and the same figures as a table that the keyboard and a screen reader can reach.
 */
export function ChartFigure(props: {
  title: string;
  basis: ReactNode;
  option: EChartsOption;
  height: number;
  table: ReactNode;
  testId?: string;
}) {
  return (
    <figure className="chart-box chart-figure" data-testid={props.testId}>
      <figcaption>
        <h4 className="chart-title">{props.title}</h4>
        <p className="chart-basis">{props.basis}</p>
      </figcaption>
      <EChart option={props.option} height={props.height} label={props.title} />
      <details className="chart-data">
        <summary>Figures as a table</summary>
        {props.table}
      </details>
    </figure>
  );
}
