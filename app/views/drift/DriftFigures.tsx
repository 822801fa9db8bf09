/**
 * Drift plots: frequency and temperature against time (live or stored), and
 * after the run frequency against temperature with the tempco line and the
 * Allan deviation on log–log axes. The time plot hands uPlot typed views of
 * the store's columns; uPlot decimates to min/max per pixel when drawing.
 */
import { useMemo, useRef } from 'react';
import type { DriftAnalysis } from '../../analysis/drift-analysis.ts';
import { driftJob } from '../../workers/analysis-jobs.ts';
import { useBackgroundAnalysis } from '../../workers/use-analysis.ts';
import type uPlot from 'uplot';
import type { ColumnSet } from '../../state/columns.ts';
import { GapDisplay } from '../../plots/gap-display.ts';
import { envelope, type EnvelopeSeries } from '../../plots/envelope.ts';
import { columnsCsv } from '../../plots/plot-export.ts';
import { PlotPanel, type PlotView } from '../../plots/PlotPanel.tsx';
import {
  baseOptions,
  decimalsFor,
  lineSeries,
  logSiAxis,
  pointSeries,
  labelFitSize,
  readoutScale,
  readoutTicks,
  siAxis,
  timeAxis,
  withAlpha,
  xSeries,
} from '../../plots/plot-options.ts';
import { FigureList } from '../FigureList.tsx';
import { adevColumns, driftKeyFigures } from './drift-key-figures.ts';
import { formatFigure } from '../../analysis/format-figure.ts';
import { tempcoColumns, type DriftOutcome } from './drift-figures.ts';
import type { PixelPreview } from '../../contract/run-preview.ts';
import { previewPlotData } from './preview-plot.ts';
import { maskedColumn } from './masked-column.ts';
import { driftReadouts } from './drift-readouts.ts';
import { heldCsv, useHeldAnalysis, useHeldWindows, type HeldLog } from './held-log.ts';

export interface DriftSource {
  key: string;
  /** Counter gate of the log: its ±1-count floor marks ADEV points and bounds the mean's digits. */
  gateS?: number;
  columns: () => ColumnSet;
  rows: () => number;
  watch?: (notify: () => void) => () => void;
  done: boolean;
  theme: string;
  /** Wall-clock start of the log, ms (multi-day logs label their time axis in dates). */
  startMs?: number | null;
  /** Set when the screen shows a stored log (no log in this window yet): which one. */
  storedFrom?: string;
  /** Set while only the run's pixel preview has arrived: drawn from it, nothing analysed yet. */
  preview?: { data: PixelPreview; rowCount: number };
  /** Set for a big stored log whose readings stay in main: drawn per view and analysed from there. */
  held?: HeldLog;
}

function DriftKeyFigures({
  outcome,
  running,
  holdV,
  previewing = false,
}: {
  outcome: DriftOutcome | null;
  running: boolean;
  holdV: number | null;
  previewing?: boolean;
}) {
  const a = outcome?.ok ? outcome.analysis : null;
  return (
    <section className="key-figures" aria-label="Drift figures" data-testid="drift-figures">
      <h2>Drift figures</h2>
      {outcome && !outcome.ok ? <p className="error-line">Analysis: {outcome.message}</p> : null}
      {!outcome ? (
        <p className="muted" data-testid={running ? 'analysis-running' : undefined}>
          {running
            ? 'Analysing the log…'
            : previewing
              ? 'Analysed once every reading has arrived.'
              : 'Shown when the log has ended.'}
        </p>
      ) : null}
      <dl className="figures">
        <FigureList figures={driftKeyFigures(a, holdV)} />
      </dl>
    </section>
  );
}

export function DriftFigures({ source }: { source: DriftSource }) {
  const gaps = useRef<{ key: string; freq: GapDisplay; temp: GapDisplay } | null>(null);
  const masked = useRef<{ key: string; rows: number; ys: [Float64Array, Float64Array] } | null>(null);
  const { held } = source;
  // A million-reading log takes seconds to analyse: off the page's thread, after the first draw; a log held in main is analysed there.
  const local = useBackgroundAnalysis<DriftAnalysis>(source.done && !held ? source.key : null, () =>
    driftJob(source.columns(), source.rows(), source.gateS),
  );
  const remote = useHeldAnalysis(held ? source.key : null, held);
  const { outcome, running } = held ? { outcome: remote?.outcome ?? null, running: remote === null } : local;
  const analysis = outcome?.ok ? outcome.analysis : null;
  const windows = useHeldWindows(held ?? null, source.key);
  // Set by the last data() call: whether the time plot shows slices (band + mean) or the readings themselves.
  const dense = useRef(false);
  const gapColumns = () => {
    const columns = source.columns();
    if (!gaps.current || gaps.current.key !== source.key) {
      gaps.current = {
        key: source.key,
        freq: new GapDisplay(columns.frequency_hz, columns.status),
        temp: new GapDisplay(columns.temperature_c, columns.status),
      };
    }
    return { columns, gaps: gaps.current };
  };
  // A finished run's columns no longer grow: its gaps are masked once, in one typed pass.
  const storedYs = (columns: ColumnSet, n: number): [Float64Array, Float64Array] => {
    if (!masked.current || masked.current.key !== source.key || masked.current.rows !== n) {
      const status = columns.status.view();
      masked.current = {
        key: source.key,
        rows: n,
        ys: [
          maskedColumn(columns.frequency_hz.view(), status, n),
          maskedColumn(columns.temperature_c.view(), status, n),
        ],
      };
    }
    return masked.current.ys;
  };
  const timeData = (view: PlotView | null, widthPx: number): uPlot.AlignedData => {
    if (held) {
      const shown = windows.data(view, widthPx);
      dense.current = shown.dense;
      return shown.data;
    }
    if (source.preview) {
      dense.current = true;
      return previewPlotData(source.preview.data, 'frequency_hz', 'temperature_c', view);
    }
    const { columns, gaps: g } = gapColumns();
    const n = source.rows();
    const x = columns.time_s.view().subarray(0, n);
    const from = view ? view.xMin : (x[0] ?? 0);
    const to = view ? view.xMax : (x[n - 1] ?? 0);
    const px = Math.max(100, view?.widthPx ?? widthPx);
    // Slices at least 4 px and 4 readings wide: a reading flipping between two counts becomes a band, and drift still shows.
    const ys = source.done ? storedYs(columns, n) : [g.freq.data(n), g.temp.data(n)];
    const env = envelope(x, ys, n, from, to, Math.floor(px / 4), Math.floor(px / 4), 4);
    dense.current = env.dense;
    const [freq, temp] = env.series as [EnvelopeSeries, EnvelopeSeries];
    return [env.x, freq.mid, freq.lo, freq.hi, temp.mid] as uPlot.AlignedData;
  };
  const timeCsv = (): string => {
    const { columns, gaps: g } = gapColumns();
    const n = source.rows();
    return columnsCsv(
      ['time_s', 'frequency_hz', 'temperature_c'],
      [columns.time_s.view().subarray(0, n), g.freq.data(n), g.temp.data(n)],
    );
  };
  const tempco = useMemo(
    () =>
      held
        ? (remote?.tempco ?? null)
        : analysis && analysis.tempcoHzPerC !== null
          ? tempcoColumns(source.columns(), source.rows(), analysis)
          : null,
    [analysis, remote],
  );
  const buildKey = `${source.key}|${source.theme}`;
  const adev = analysis && analysis.adev.length > 0 ? adevColumns(analysis) : null;
  const readouts = driftReadouts(source.gateS, analysis);
  return (
    <div className="sweep-figures">
      <div className="plots">
        {source.storedFrom ? (
          <p className="muted stored-from" data-testid="stored-from">
            Latest stored drift log: {source.storedFrom}. Start a log to replace it here; the Run archive has the
            others.
          </p>
        ) : null}
        <PlotPanel
          testId="drift-plot"
          title="Frequency and temperature against time"
          buildKey={buildKey}
          height={320}
          data={timeData}
          {...(held ? { csv: () => heldCsv(held) } : source.preview ? {} : { csv: timeCsv })}
          cursorReadouts={{ x: readouts.time, y: readouts.frequency }}
          exportName={`drift-${source.key}`}
          watch={held ? windows.watch : source.watch}
          dataFollowsView={held !== undefined}
          options={(colors, width, height) =>
            baseOptions(
              width,
              height,
              [
                xSeries('Time', readouts.time),
                lineSeries('Frequency', colors.series[0], readouts.frequency, {
                  points: { show: () => !dense.current, size: 4, stroke: colors.series[0], fill: colors.series[0] },
                }),
                lineSeries('Lowest in slice', 'transparent', readouts.frequency, { width: 0 }),
                lineSeries('Highest in slice', 'transparent', readouts.frequency, { width: 0 }),
                lineSeries('Temperature', colors.series[1], readouts.temperature, { scale: '°C' }),
              ],
              [
                timeAxis(colors, 'Time', source.startMs ?? null),
                siAxis(colors, 'Frequency', 'Hz', { size: labelFitSize(96), ...readoutTicks(readouts.frequency) }),
                {
                  ...siAxis(colors, 'Temperature', '°C', readoutTicks(readouts.temperature)),
                  scale: '°C',
                  side: 1,
                  size: 84,
                  labelGap: 6,
                  grid: { show: false },
                  values: (_u, vals, _a, _s, incr) => vals.map((v) => `${v.toFixed(decimalsFor(incr))} °C`),
                },
              ],
              {
                bands: [{ series: [3, 2], fill: withAlpha(colors.series[0], 0.2) }],
                scales: {
                  x: { time: false },
                  y: readoutScale(readouts.frequency),
                  '°C': readoutScale(readouts.temperature),
                },
              },
            )
          }
          footer={
            source.preview ? (
              <span className="muted" data-testid="drift-preview-note">
                Preview: {source.preview.rowCount.toLocaleString('en')} readings drawn at screen resolution (lowest to
                highest and mean per pixel column). Loading every reading for zoom and analysis…
              </span>
            ) : (
              <span data-testid="drift-plot-key">
                Where readings are denser than the screen, the shaded band spans the lowest to highest reading in each
                slice of time and the line is their mean; zoom in to see each reading.
              </span>
            )
          }
        />
        {tempco ? (
          <PlotPanel
            testId="tempco-plot"
            title="Frequency against temperature"
            buildKey={`${buildKey}|tempco`}
            height={240}
            data={() => [tempco.temperatureC, tempco.frequencyHz, tempco.lineHz] as uPlot.AlignedData}
            options={(colors, width, height) =>
              baseOptions(
                width,
                height,
                [
                  xSeries('Temperature', readouts.temperature),
                  pointSeries('Frequency', colors.series[0], readouts.frequency, {
                    points: { show: true, size: 3, stroke: colors.series[0], fill: colors.series[0] },
                  }),
                  lineSeries('Tempco line', colors.fit, readouts.frequency, { width: 2 }),
                ],
                [
                  {
                    ...siAxis(colors, 'Temperature', '°C', readoutTicks(readouts.temperature)),
                    space: 72,
                    values: (_u, vals, _a, _s, incr) => vals.map((v) => `${v.toFixed(decimalsFor(incr))} °C`),
                  },
                  siAxis(colors, 'Frequency', 'Hz', { size: labelFitSize(96), ...readoutTicks(readouts.frequency) }),
                ],
              )
            }
          />
        ) : null}
        {adev ? (
          <PlotPanel
            testId="adev-plot"
            title="Allan deviation (overlapping) of fractional frequency"
            buildKey={`${buildKey}|adev`}
            height={240}
            data={() => [adev.tauS, adev.adev, adev.limited] as uPlot.AlignedData}
            options={(colors, width, height) =>
              baseOptions(
                width,
                height,
                [
                  xSeries('τ', readouts.tau),
                  lineSeries('σy(τ)', colors.series[2], readouts.adev, { points: { show: true, size: 5 } }),
                  // At or below the counter's ±1-count floor 1/(gate·f): the counter, not the oscillator.
                  pointSeries('resolution-limited (±1 count)', colors.text, readouts.adev, {
                    points: { show: true, size: 11, width: 2, stroke: colors.text, fill: 'transparent' },
                  }),
                ],
                [
                  logSiAxis(colors, 'Averaging time τ', 's'),
                  {
                    ...siAxis(colors, 'σy(τ)', ''),
                    values: (_u, vals) => vals.map((v) => (v === null ? '' : formatFigure(v, '', { digits: 1 }))),
                  },
                ],
                { scales: { x: { time: false, distr: 3 }, y: { distr: 3 } } },
              )
            }
            footer={
              adev.limited.some((v) => v !== null) ? (
                <span className="mark-key" data-testid="adev-limited-key">
                  ○ ring: at or below the counter&apos;s ±1-count floor 1/(gate·f) ={' '}
                  {formatFigure(analysis?.resolutionFloor, '', { digits: 2 })}: resolution-limited, not the oscillator
                </span>
              ) : undefined
            }
          />
        ) : null}
      </div>
      <DriftKeyFigures
        outcome={outcome}
        running={running}
        holdV={held ? (remote?.holdV ?? null) : source.rows() > 0 ? source.columns().control_v.at(0) : null}
        previewing={source.preview !== undefined}
      />
    </div>
  );
}
