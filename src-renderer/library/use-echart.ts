import { useEffect, useRef } from 'react';
import { LineChart } from 'echarts/charts';
import { DataZoomComponent, GridComponent, TooltipComponent } from 'echarts/components';
import * as echarts from 'echarts/core';
import { CanvasRenderer } from 'echarts/renderers';

echarts.use([LineChart, GridComponent, TooltipComponent, DataZoomComponent, CanvasRenderer]);

export type ChartOption = Parameters<echarts.ECharts['setOption']>[0];

/**
 * One ECharts instance bound to a div for the life of the component: options replace the
 * previous ones, and the chart follows its box's size. Canvas rendering draws no inline styles
 * into the page, which keeps the strict Content-Security-Policy of the web host quiet.
 */
export function useEChart(option: ChartOption) {
  const box = useRef<HTMLDivElement>(null);
  const chart = useRef<echarts.ECharts | null>(null);
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
    chart.current?.setOption(option, { notMerge: true });
  }, [option]);
  return box;
}
