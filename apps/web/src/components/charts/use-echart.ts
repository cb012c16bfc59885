import { useEffect, useRef, useState } from 'react';
import { echarts, type ChartOption } from './echarts.ts';

/**
 * Mounts one ECharts instance on the returned ref's element, applies `option` whenever it
 * changes (replacing, not merging, so removed series disappear) and follows the element's
 * size. `onReady` receives the instance once (for pointer handlers); `chart` is the instance
 * once mounted, for children that subscribe to its events (their effects run before this
 * hook's, so they cannot read `chartRef` at mount).
 */
export function useEChart(
  option: ChartOption,
  onReady?: (chart: echarts.ECharts) => void | (() => void),
) {
  const ref = useRef<HTMLDivElement | null>(null);
  const chartRef = useRef<echarts.ECharts | null>(null);
  const [chart, setChart] = useState<echarts.ECharts | null>(null);
  const readyRef = useRef(onReady);
  useEffect(() => {
    readyRef.current = onReady;
  });

  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    const chart = echarts.init(el, undefined, { renderer: 'canvas' });
    chartRef.current = chart;
    setChart(chart);
    const cleanup = readyRef.current?.(chart);
    // The observer reports the element's size once at the start too: resizing to the size
    // the chart already has would lay it out and draw it a second time, for nothing.
    const observer = new ResizeObserver(() => {
      if (el.clientWidth !== chart.getWidth() || el.clientHeight !== chart.getHeight())
        chart.resize();
    });
    observer.observe(el);
    return () => {
      observer.disconnect();
      if (typeof cleanup === 'function') cleanup();
      chart.dispose();
      chartRef.current = null;
      setChart(null);
    };
  }, []);

  useEffect(() => {
    chartRef.current?.setOption(option, { notMerge: true });
  }, [option]);

  return { ref, chartRef, chart };
}
