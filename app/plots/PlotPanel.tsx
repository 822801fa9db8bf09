/**
 * One uPlot chart. React only mounts it; data flows outside React: `watch`
 * tells the panel that the source changed, and the panel pulls `data()` and
 * calls setData at most once per animation frame. The chart is rebuilt when
 * `buildKey` changes (theme, series layout), not when data changes.
 *
 * The toolbar gives the working tools: zoom by dragging along time/x, along
 * y or a box, a visible reset (double-click does the same), and export of
 * the chart as PNG and SVG and of its data as CSV.
 */
import { useEffect, useRef, useState } from 'react';
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';
import { downloadBlob } from './download-blob.ts';
import { recordPlotWork } from './frame-work.ts';
import { createFrameGate } from './frame-gate.ts';
import { readPlotColors, type PlotColors } from './plot-colors.ts';
import { chartCsv, chartPng, chartSvg } from './plot-export.ts';
import { cursorTexts, markAt, type CursorMark } from './cursor-pair.ts';
import type { Readout } from './readout.ts';

/** The x range on screen when the user has zoomed (null: the whole data). */
export interface PlotView {
  xMin: number;
  xMax: number;
  widthPx: number;
}

export type ZoomMode = 'x' | 'y' | 'box';

export interface PlotPanelProps {
  testId: string;
  title: string;
  /** Changes force a rebuild of the chart (theme, series layout). */
  buildKey: string;
  options(colors: PlotColors, width: number, height: number): uPlot.Options;
  /** The data to draw; `view` is the zoomed x range (decimating sources draw only that), null when not zoomed; `widthPx` the plot area's width. */
  data(view: PlotView | null, widthPx: number): uPlot.AlignedData;
  /** Subscribe to "data may have changed"; returns the unsubscribe. */
  watch?(notify: () => void): () => void;
  /**
   * The data is cut for the view (a log held in main, its slices arriving after the zoom): new data is drawn at
   * once within the zoomed x range (uPlot's setData that keeps the scales neither re-indexes nor redraws).
   */
  dataFollowsView?: boolean;
  height?: number;
  /** Shown instead of an empty chart. */
  emptyText?: string;
  isEmpty?: boolean;
  /** File name stem for exports; defaults to the test id. */
  exportName?: string;
  /** Full data as CSV (default: what the chart holds). */
  csv?: () => string | Promise<string | Blob>;
  /** Extra lines under the chart (legend of marks). */
  footer?: React.ReactNode;
  /** Read-outs of x and y (unit and resolution): enables two cursors (click readings) with Δx, Δy and the slope. */
  cursorReadouts?: { x: Readout; y: Readout };
}

function CursorReadout({
  marks,
  readouts,
  onClear,
  testId,
}: {
  marks: CursorMark[];
  readouts: { x: Readout; y: Readout };
  onClear: () => void;
  testId: string;
}) {
  const text = cursorTexts(marks, readouts.x, readouts.y);
  return (
    <div className="cursor-readout" data-testid={`${testId}-cursors`} aria-live="polite">
      {marks.length === 0 ? <span>Click a reading to place cursor A, another for B.</span> : null}
      {text.a ? <span>A: {text.a}</span> : null}
      {text.b ? <span>B: {text.b}</span> : null}
      {text.deltas ? <strong data-testid={`${testId}-deltas`}>{text.deltas}</strong> : null}
      {marks.length > 0 ? (
        <button type="button" className="quiet plot-tool" onClick={onClear}>
          Clear cursors
        </button>
      ) : null}
    </div>
  );
}

const ZOOM_LABEL: Record<ZoomMode, string> = {
  x: 'Drag zooms along x',
  y: 'Drag zooms along y',
  box: 'Drag zooms a box',
};

export function PlotPanel(props: PlotPanelProps) {
  const hostRef = useRef<HTMLDivElement | null>(null);
  const chartRef = useRef<uPlot | null>(null);
  const resetRef = useRef<() => void>(() => undefined);
  const redrawCursors = useRef<() => void>(() => undefined);
  // The latest callbacks, read by the chart without rebuilding it.
  const latest = useRef(props);
  latest.current = props;
  const height = props.height ?? 300;
  const [zoom, setZoom] = useState<ZoomMode>('x');
  const [zoomed, setZoomed] = useState(false);
  const [marks, setMarks] = useState<CursorMark[]>([]);
  const marksRef = useRef<CursorMark[]>([]);
  marksRef.current = marks;
  const cursorsOn = props.cursorReadouts !== undefined;

  useEffect(() => {
    const host = hostRef.current;
    if (!host) return;
    const colors = readPlotColors();
    const width = Math.max(200, host.clientWidth);
    let view: PlotView | null = null;
    const base = latest.current.options(colors, width, height);
    const options: uPlot.Options = {
      ...base,
      cursor: {
        ...base.cursor,
        drag: { ...(base.cursor?.drag ?? {}), x: zoom !== 'y', y: zoom !== 'x', setScale: true },
        // Double-click resets through the panel, so the decimated view is rebuilt too.
        bind: { ...(base.cursor?.bind ?? {}), dblclick: () => () => null },
      },
      hooks: {
        ...base.hooks,
        setSelect: [
          ...(base.hooks?.setSelect ?? []),
          (u) => {
            if (u.select.width > 0 || u.select.height > 0) markZoomed = true;
          },
        ],
        setScale: [
          ...(base.hooks?.setScale ?? []),
          (u, key) => {
            if (!markZoomed) return;
            // A zoom along y alone sets no x view, but the reset must show all the same.
            if (key !== 'x') {
              setZoomed(true);
              return;
            }
            const min = u.scales.x?.min;
            const max = u.scales.x?.max;
            if (min === undefined || max === undefined || min === null || max === null) return;
            // The range put back after new data (below) is no new view.
            if (view !== null && view.xMin === min && view.xMax === max) return;
            view = { xMin: min, xMax: max, widthPx: u.bbox.width / (window.devicePixelRatio || 1) };
            setZoomed(true);
            gate.request();
          },
        ],
      },
    };
    let markZoomed = false;
    // Before the first draw the plot area is not known: axes take about a third of a small chart.
    const chart = new uPlot(options, latest.current.data(null, Math.round(width * 0.7)), host);
    chartRef.current = chart;
    // A mark per drawn chart, so benchmarks can time "data in → first draw" from outside.
    performance.mark(`tunebench:plot-drawn:${latest.current.testId}`);
    const gate = createFrameGate(
      () => {
        const startMs = performance.now();
        // While zoomed, new data must not throw the user's view away.
        chart.setData(
          latest.current.data(view, chart.bbox.width / (window.devicePixelRatio || 1)),
          view === null && !markZoomed,
        );
        if (view !== null && latest.current.dataFollowsView) chart.setScale('x', { min: view.xMin, max: view.xMax });
        // uPlot redraws in a microtask it queued in setData; this one runs after it.
        queueMicrotask(() => recordPlotWork(startMs, performance.now()));
      },
      (cb) => requestAnimationFrame(cb),
    );
    resetRef.current = () => {
      view = null;
      markZoomed = false;
      setZoomed(false);
      chart.setData(latest.current.data(null, chart.bbox.width / (window.devicePixelRatio || 1)), true);
    };
    const unwatch = latest.current.watch?.(() => gate.request()) ?? (() => undefined);
    // Cursors: a click without a drag places A, then B, then starts again at A.
    let downAt: [number, number] | null = null;
    const onDown = (e: MouseEvent) => {
      downAt = [e.clientX, e.clientY];
    };
    const onClick = (e: MouseEvent) => {
      if (!latest.current.cursorReadouts) return;
      const moved = downAt ? Math.hypot(e.clientX - downAt[0], e.clientY - downAt[1]) : 0;
      if (moved > 3) return;
      const mark = markAt(chart.data, chart.cursor.idx);
      if (!mark) return;
      const current = marksRef.current;
      setMarks(current.length >= 2 ? [mark] : [...current, mark]);
    };
    chart.over.addEventListener('mousedown', onDown);
    chart.over.addEventListener('click', onClick);
    const lines = new Map<number, HTMLDivElement>();
    const placeCursorLines = () => {
      marksRef.current.forEach((mark, i) => {
        let line = lines.get(i);
        if (!line) {
          line = document.createElement('div');
          line.className = `cursor-line cursor-${i === 0 ? 'a' : 'b'}`;
          line.dataset.label = i === 0 ? 'A' : 'B';
          chart.over.appendChild(line);
          lines.set(i, line);
        }
        line.style.left = `${chart.valToPos(mark.x, 'x')}px`;
        line.style.display = '';
      });
      for (const [i, line] of lines) if (i >= marksRef.current.length) line.style.display = 'none';
    };
    chart.hooks.draw = [...(chart.hooks.draw ?? []), placeCursorLines];
    redrawCursors.current = () => placeCursorLines();
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
      chart.over.removeEventListener('mousedown', onDown);
      chart.over.removeEventListener('click', onClick);
      chart.destroy();
      chartRef.current = null;
      setZoomed(false);
    };
  }, [props.buildKey, height, zoom]);

  useEffect(() => {
    redrawCursors.current();
  }, [marks]);

  const stem = (props.exportName ?? props.testId).replace(/[^\w.-]+/g, '-');
  const themeColors = () => {
    const style = getComputedStyle(document.documentElement);
    return {
      text: style.getPropertyValue('--text').trim() || '#222',
      grid: readPlotColors().grid,
      background: style.getPropertyValue('--bg-raised').trim() || '#fff',
    };
  };
  const exportAs = async (format: 'png' | 'svg' | 'csv') => {
    const chart = chartRef.current;
    if (!chart) return;
    if (format === 'png') downloadBlob(`${stem}.png`, await chartPng(chart, props.title, themeColors()));
    else if (format === 'svg')
      downloadBlob(`${stem}.svg`, new Blob([chartSvg(chart, props.title, themeColors())], { type: 'image/svg+xml' }));
    else {
      // A log held in main comes from main whole, as a Blob of its parts.
      const csv = latest.current.csv ? await latest.current.csv() : chartCsv(chart);
      downloadBlob(`${stem}.csv`, csv instanceof Blob ? csv : new Blob([csv], { type: 'text/csv' }));
    }
  };

  return (
    <figure className="plot" data-testid={props.testId} aria-label={props.title}>
      <div className="plot-head">
        <figcaption className="plot-title">{props.title}</figcaption>
        {props.isEmpty ? null : (
          <div className="plot-tools" role="toolbar" aria-label={`${props.title}: tools`}>
            <select
              className="plot-tool"
              value={zoom}
              onChange={(e) => setZoom(e.target.value as ZoomMode)}
              aria-label="Zoom by dragging"
              data-testid={`${props.testId}-zoom-mode`}
            >
              {(Object.keys(ZOOM_LABEL) as ZoomMode[]).map((mode) => (
                <option key={mode} value={mode}>
                  {ZOOM_LABEL[mode]}
                </option>
              ))}
            </select>
            {zoomed ? (
              <button
                type="button"
                className="plot-tool plot-reset"
                onClick={() => resetRef.current()}
                data-testid={`${props.testId}-reset`}
              >
                Whole range
              </button>
            ) : null}
            <button
              type="button"
              className="plot-tool"
              onClick={() => void exportAs('png')}
              data-testid={`${props.testId}-png`}
              title="Save the chart as a PNG image"
            >
              PNG
            </button>
            <button
              type="button"
              className="plot-tool"
              onClick={() => void exportAs('svg')}
              data-testid={`${props.testId}-svg`}
              title="Save the chart as an SVG drawing"
            >
              SVG
            </button>
            <button
              type="button"
              className="plot-tool"
              onClick={() => void exportAs('csv')}
              data-testid={`${props.testId}-csv`}
              title="Save the chart's data as CSV"
            >
              CSV
            </button>
          </div>
        )}
      </div>
      <div
        className={props.isEmpty ? 'plot-host plot-host-hidden' : 'plot-host'}
        ref={hostRef}
        onDoubleClick={() => resetRef.current()}
      />
      {props.isEmpty ? <p className="plot-empty">{props.emptyText ?? 'No readings yet.'}</p> : null}
      {cursorsOn && !props.isEmpty && props.cursorReadouts ? (
        <CursorReadout
          marks={marks}
          readouts={props.cursorReadouts}
          onClear={() => setMarks([])}
          testId={props.testId}
        />
      ) : null}
      {props.footer && !props.isEmpty ? <div className="plot-footer">{props.footer}</div> : null}
    </figure>
  );
}
