/**
 * One uPlot chart. React only mounts it; data flows outside React: `watch`
 * tells the panel that the source changed, and the panel pulls `data()` and
 * calls setData at most once per animation frame. The chart is rebuilt when
 * `buildKey` changes (theme, series layout), not when data changes.
 */
import { useEffect, useRef } from 'react';
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';
import { recordPlotWork } from './frame-work.ts';
import { createFrameGate } from './frame-gate.ts';
import { readPlotColors, type PlotColors } from './plot-colors.ts';

export interface PlotPanelProps {
  testId: string;
  title: string;
  /** Changes force a rebuild of the chart (theme, series layout). */
  buildKey: string;
  options(colors: PlotColors, width: number, height: number): uPlot.Options;
  data(): uPlot.AlignedData;
  /** Subscribe to "data may have changed"; returns the unsubscribe. */
  watch?(notify: () => void): () => void;
  height?: number;
  /** Shown instead of an empty chart. */
  emptyText?: string;
  isEmpty?: boolean;
}

export function PlotPanel(props: PlotPanelProps) {
  const hostRef = useRef<HTMLDivElement | null>(null);
  // The latest callbacks, read by the chart without rebuilding it.
  const latest = useRef(props);
  latest.current = props;
  const height = props.height ?? 300;

  useEffect(() => {
    const host = hostRef.current;
    if (!host) return;
    const colors = readPlotColors();
    const width = Math.max(200, host.clientWidth);
    const chart = new uPlot(latest.current.options(colors, width, height), latest.current.data(), host);
    // A mark per drawn chart, so benchmarks can time "data in → first draw" from outside.
    performance.mark(`tunebench:plot-drawn:${latest.current.testId}`);
    const gate = createFrameGate(() => {
      const startMs = performance.now();
      chart.setData(latest.current.data());
      // uPlot redraws in a microtask it queued in setData; this one runs after it.
      queueMicrotask(() => recordPlotWork(startMs, performance.now()));
    }, (cb) => requestAnimationFrame(cb));
    const unwatch = latest.current.watch?.(() => gate.request()) ?? (() => undefined);
    const resize = new ResizeObserver(() => {
      const w = Math.max(200, host.clientWidth);
      if (w !== chart.width) chart.setSize({ width: w, height });
    });
    resize.observe(host);
    return () => {
      performance.mark(`tunebench:plot-removed:${latest.current.testId}`);
      gate.cancel();
      unwatch();
      resize.disconnect();
      chart.destroy();
    };
  }, [props.buildKey, height]);

  return (
    <figure className="plot" data-testid={props.testId} aria-label={props.title}>
      <figcaption className="plot-title">{props.title}</figcaption>
      <div className={props.isEmpty ? 'plot-host plot-host-hidden' : 'plot-host'} ref={hostRef} />
      {props.isEmpty ? <p className="plot-empty">{props.emptyText ?? 'No readings yet.'}</p> : null}
    </figure>
  );
}
