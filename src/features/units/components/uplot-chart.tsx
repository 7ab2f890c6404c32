import { useEffect, useRef } from 'react';
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';

export interface UPlotChartProps {
  /** Options without width and height (the chart takes its container's width). */
  options: Omit<uPlot.Options, 'width' | 'height'>;
  data: uPlot.AlignedData;
  height: number;
  className?: string;
}

/**
 * A uPlot chart that follows its container's width. It is rebuilt when the options object changes
 * (memoise it) and only fed new data otherwise.
 */
export function UPlotChart({ options, data, height, className }: UPlotChartProps) {
  const box = useRef<HTMLDivElement>(null);
  const plot = useRef<uPlot | null>(null);
  const dataRef = useRef(data);
  dataRef.current = data;

  useEffect(() => {
    const el = box.current;
    if (!el) return;
    const u = new uPlot({ ...options, width: Math.max(el.clientWidth, 200), height }, dataRef.current, el);
    plot.current = u;
    const ro =
      typeof ResizeObserver === 'undefined' ? null : new ResizeObserver(() => u.setSize({ width: Math.max(el.clientWidth, 200), height }));
    ro?.observe(el);
    return () => {
      ro?.disconnect();
      u.destroy();
      plot.current = null;
    };
  }, [options, height]);

  useEffect(() => {
    plot.current?.setData(data);
  }, [data]);

  return <div ref={box} className={className} aria-hidden="true" />;
}

export { uPlot };
