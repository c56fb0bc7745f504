import { useEffect, useLayoutEffect, useRef, type ReactNode } from 'react';
import { echarts, type EChartsOption } from './echarts-setup.js';

/**
 * One ECharts canvas that follows its option and its box size. The canvas is a picture for the
 * eye: the figure around it carries the title, the units and the data table for everyone else.
 */
export function EChart({
  option,
  height,
  label,
  seriesById = false,
}: {
  option: EChartsOption;
  height: number;
  label: string;
  /**
   * Every series of every option has an `id`: a new option then updates the chart in place
   * (axes, legend and tooltip kept, series matched by id, series not named any more removed)
   * instead of building it again, which costs several ms per chart on every recompute.
   */
  seriesById?: boolean;
}) {
  const box = useRef<HTMLDivElement>(null);
  const chart = useRef<ReturnType<typeof echarts.init> | null>(null);
  const latest = useRef(option);
  latest.current = option;
  // Created after the first paint (a passive effect): making the canvas reads the box's size, and
  // doing that before the page is painted held back the first screen.
  useEffect(() => {
    if (!box.current) return;
    const instance = echarts.init(box.current, undefined, { renderer: 'canvas' });
    chart.current = instance;
    instance.setOption(latest.current, { notMerge: true, lazyUpdate: true });
    const observer = new ResizeObserver(() => instance.resize());
    observer.observe(box.current);
    return () => {
      observer.disconnect();
      instance.dispose();
      chart.current = null;
    };
  }, []);
  // Later options are set in the layout phase, before the browser paints the commit: ECharts draws
  // a lazy update in its next frame callback, so the picture is drawn in the frame that paints the
  // page around it.
  useLayoutEffect(() => {
    const instance = chart.current;
    if (!instance) return;
    if (seriesById) instance.setOption(option, { replaceMerge: ['series'], lazyUpdate: true });
    else instance.setOption(option, { notMerge: true, lazyUpdate: true });
  }, [option, seriesById]);
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
  /** See EChart. */
  seriesById?: boolean;
}) {
  return (
    <figure className="chart-box chart-figure" data-testid={props.testId}>
      <figcaption>
        <h4 className="chart-title">{props.title}</h4>
        <p className="chart-basis">{props.basis}</p>
      </figcaption>
      <EChart option={props.option} height={props.height} label={props.title} seriesById={props.seriesById} />
      <details className="chart-data">
        <summary>Figures as a table</summary>
        {props.table}
      </details>
    </figure>
  );
}
