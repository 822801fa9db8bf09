/**
 * The sweep's plots and key figures. While readings arrive, the frequency
 * plot fills in and a live stall estimate is shaded; once the sweep is done
 * the analysis adds the fitted curve, Kvco against V, residuals and figures.
 */
import { useRef } from 'react';
import type { SweepAnalysis } from '../../analysis/sweep-types.ts';
import { sweepJob } from '../../workers/analysis-jobs.ts';
import { useBackgroundAnalysis } from '../../workers/use-analysis.ts';
import type uPlot from 'uplot';
import type { ColumnSet } from '../../state/columns.ts';
import { PlotPanel } from '../../plots/PlotPanel.tsx';
import { baseOptions, lineSeries, pointSeries, siAxis, xSeries } from '../../plots/plot-options.ts';
import { deadMarksPlugin } from '../../plots/dead-marks-plugin.ts';
import { regionsPlugin, type XRegion } from '../../plots/regions-plugin.ts';
import { buildSweepDisplay, liveStallEstimateV } from '../../plots/sweep-display.ts';
import { FigureList } from '../FigureList.tsx';
import { setpointText } from '../figure-text.ts';
import { readoutText } from '../../plots/readout.ts';
import { sameSetpointValue } from './direction-readout.ts';
import {
  fitOnX,
  gainColumns,
  residualColumns,
  stallRegions,
  sweepRegions,
  usableEndV,
  type SweepOutcome,
} from './sweep-figures.ts';
import { sweepKeyFigures } from './sweep-key-figures.ts';
import { residualUncertainty, sweepReadouts } from './sweep-readouts.ts';

export interface SweepSource {
  /** Identity of the data set (run id); a new id rebuilds the charts. */
  key: string;
  columns(): ColumnSet;
  rows(): number;
  watch?: (notify: () => void) => () => void;
  /** True once no more readings will come: the analysis runs then. */
  done: boolean;
  gateS?: number;
  theme: string;
  /** Wall-clock start of the run, ms. */
  startMs?: number | null;
  /** Set when the screen shows a stored run (no run in this window yet): which one. */
  storedFrom?: string;
}

export function KeyFigures({ outcome, running }: { outcome: SweepOutcome | null; running: boolean }) {
  const a = outcome?.ok ? outcome.analysis : null;
  return (
    <section className="key-figures" aria-label="Key figures" data-testid="key-figures">
      <h2>Key figures</h2>
      {outcome && !outcome.ok ? (
        <p className="error-line" data-testid="analysis-error">
          Analysis: {outcome.message}
        </p>
      ) : null}
      {!outcome ? (
        <p className="muted" data-testid={running ? 'analysis-running' : undefined}>
          {running ? 'Analysing the sweep…' : 'Shown when the sweep has finished.'}
        </p>
      ) : null}
      <dl className="figures">
        <FigureList figures={sweepKeyFigures(a)} />
      </dl>
      {a && a.warnings.length > 0 ? (
        <ul className="warnings" data-testid="analysis-warnings">
          {a.warnings.map((w) => (
            <li key={w}>{w}</li>
          ))}
        </ul>
      ) : null}
    </section>
  );
}

/** What the plot's marks mean: the stall wash, the unsteady hatching, the usable-range edge, the × marks. */
function SweepMarksKey({ end, zone }: { end: number | null; zone: SweepAnalysis['usableRange']['edgeZone'] }) {
  return (
    <>
      <span className="mark-key" data-testid="key-stall">
        <span className="swatch swatch-stall" aria-hidden="true" /> no oscillation (stall)
      </span>
      <span className="mark-key" data-testid="key-unstable">
        <span className="swatch swatch-unstable" aria-hidden="true" /> unsteady oscillation
      </span>
      {zone ? (
        <span className="mark-key" data-testid="key-edge-zone">
          <span className="swatch swatch-edge-zone" aria-hidden="true" /> stall edge&apos;s zone, left out of the usable
          range ({setpointText(zone.fromV)} – {setpointText(zone.toV)})
        </span>
      ) : null}
      {end !== null ? (
        <span className="mark-key" data-testid="key-unusable">
          <span className="swatch swatch-unusable" aria-hidden="true" /> outside the usable range (above{' '}
          {setpointText(end)})
        </span>
      ) : null}
      <span className="mark-key">× reading with no oscillation</span>
      <span className="mark-key">● rising · ○ falling</span>
    </>
  );
}

export function SweepFigures({ source }: { source: SweepSource }) {
  // Off the page's thread; the live plot stays drawn meanwhile.
  const { outcome, running } = useBackgroundAnalysis<SweepAnalysis>(source.done ? source.key : null, () =>
    sweepJob(source.columns(), source.rows(), source.gateS),
  );
  const analysis = outcome?.ok ? outcome.analysis : null;
  const regionsRef = useRef<readonly XRegion[]>([]);
  const deadRef = useRef<readonly number[]>([]);
  // The last display rows, for the readout of both directions at the cursor's setpoint.
  const shownRef = useRef<{ x: number[]; up: (number | null)[]; down: (number | null)[] }>({ x: [], up: [], down: [] });
  const sweepData = (): uPlot.AlignedData => {
    const n = source.rows();
    const columns = source.columns();
    const shown = buildSweepDisplay(columns, n);
    deadRef.current = shown.deadX;
    shownRef.current = shown;
    regionsRef.current = analysis ? sweepRegions(analysis) : stallRegions(liveStallEstimateV(columns, n), null);
    const fit = analysis ? fitOnX(analysis, shown.x) : shown.x.map(() => null);
    return [shown.x, shown.up, shown.down, fit] as uPlot.AlignedData;
  };
  const buildKey = `${source.key}|${source.theme}|${analysis ? 'fit' : 'live'}`;
  const gain = analysis ? gainColumns(analysis) : null;
  const residuals = analysis ? residualColumns(analysis) : null;
  const readouts = sweepReadouts(
    analysis,
    source.gateS,
    (i) => shownRef.current.x[i],
    gain,
    analysis ? residualUncertainty(analysis, source.gateS) : null,
  );

  return (
    <div className="sweep-figures">
      <div className="plots">
        {source.storedFrom ? (
          <p className="muted stored-from" data-testid="stored-from">
            Latest stored sweep: {source.storedFrom}. Start a sweep to replace it here; the Run archive has the others.
          </p>
        ) : null}
        <PlotPanel
          testId="sweep-plot"
          title="Frequency against control voltage (× = no oscillation)"
          buildKey={buildKey}
          height={340}
          data={sweepData}
          watch={source.watch}
          cursorReadouts={{ x: readouts.control, y: readouts.reading }}
          options={(colors, width, height) =>
            baseOptions(
              width,
              height,
              [
                xSeries('Control', readouts.control),
                // Rising as filled dots, falling as wider rings around them: where both agree, both stay visible.
                pointSeries('Rising', colors.series[0], readouts.reading, {
                  value: (_u, v, _s, k) =>
                    readoutText(
                      readouts.reading,
                      v ?? (k === null ? null : sameSetpointValue(shownRef.current.x, shownRef.current.up, k)),
                    ),
                }),
                pointSeries('Falling', colors.series[1], readouts.reading, {
                  points: { show: true, size: 11, width: 1.5, stroke: colors.series[1], fill: 'transparent' },
                  value: (_u, v, _s, k) =>
                    readoutText(
                      readouts.reading,
                      v ?? (k === null ? null : sameSetpointValue(shownRef.current.x, shownRef.current.down, k)),
                    ),
                }),
                lineSeries('Fitted curve', colors.fit, readouts.fit, { width: 2 }),
              ],
              [siAxis(colors, 'Control voltage', 'V'), siAxis(colors, 'Frequency', 'Hz', { size: 84 })],
              {
                plugins: [
                  regionsPlugin(() => regionsRef.current),
                  deadMarksPlugin(
                    () => deadRef.current,
                    () => colors.text,
                  ),
                ],
              },
            )
          }
          footer={
            <SweepMarksKey
              end={analysis ? usableEndV(analysis) : null}
              zone={analysis ? analysis.usableRange.edgeZone : null}
            />
          }
        />
        {gain ? (
          <PlotPanel
            testId="kvco-plot"
            title="Kvco against control voltage"
            buildKey={`${buildKey}|gain`}
            height={220}
            data={() => [gain.v, gain.stable, gain.unstable] as uPlot.AlignedData}
            options={(colors, width, height) =>
              baseOptions(
                width,
                height,
                [
                  xSeries('Control', readouts.control),
                  lineSeries('Kvco', colors.series[0], readouts.kvco, { points: { show: true, size: 4 } }),
                  pointSeries("Kvco, unsteady or stall edge's zone (not quoted)", colors.series[1], readouts.kvco),
                ],
                [siAxis(colors, 'Control voltage', 'V'), siAxis(colors, 'Kvco', 'Hz/V', { size: 84 })],
              )
            }
          />
        ) : null}
        {residuals ? (
          <PlotPanel
            testId="residual-plot"
            title="Residuals from the fitted curve"
            buildKey={`${buildKey}|resid`}
            height={180}
            data={() => [residuals.v, residuals.residualHz] as uPlot.AlignedData}
            options={(colors, width, height) =>
              baseOptions(
                width,
                height,
                [xSeries('Control', readouts.control), pointSeries('Residual', colors.series[2], readouts.residual)],
                [siAxis(colors, 'Control voltage', 'V'), siAxis(colors, 'Residual', 'Hz', { size: 84 })],
              )
            }
          />
        ) : null}
      </div>
      <KeyFigures outcome={outcome} running={running} />
    </div>
  );
}
