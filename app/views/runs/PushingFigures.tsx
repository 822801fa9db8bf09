/**
 * A stored supply-pushing run: frequency against the DUT's supply voltage
 * (mean per step) with the fitted line, and the pushing figures.
 */
import { useMemo } from 'react';
import type uPlot from 'uplot';
import type { ColumnSet } from '../../state/columns.ts';
import { PlotPanel } from '../../plots/PlotPanel.tsx';
import { baseOptions, lineSeries, pointSeries, siAxis, xSeries } from '../../plots/plot-options.ts';
import { FigureList } from '../FigureList.tsx';
import { analyzePushingColumns, pushingKeyFigures, pushingPlotColumns, pushingReadouts } from './pushing-figures.ts';

export interface PushingSource {
  key: string;
  columns(): ColumnSet;
  rows(): number;
  theme: string;
  /** Counter gate of the run: the ±1-count resolution of its readings. */
  gateS?: number;
}

export function PushingFigures({ source }: { source: PushingSource }) {
  const outcome = useMemo(() => analyzePushingColumns(source.columns(), source.rows()), [source.key]);
  const a = outcome.ok ? outcome.analysis : null;
  const plot = useMemo(() => (a ? pushingPlotColumns(a, source.gateS) : null), [a]);
  const readouts = plot ? pushingReadouts(plot, source.gateS) : null;
  return (
    <div className="sweep-figures">
      <div className="plots">
        {plot && readouts ? (
          <PlotPanel
            testId="pushing-plot"
            title="Frequency against DUT supply voltage"
            buildKey={`${source.key}|${source.theme}|pushing`}
            height={260}
            data={() => [plot.supplyV, plot.meanHz, plot.lineHz] as uPlot.AlignedData}
            options={(colors, width, height) =>
              baseOptions(
                width,
                height,
                [
                  xSeries('Supply', readouts.supply),
                  pointSeries('Mean frequency', colors.series[0], readouts.mean),
                  lineSeries('Fitted line', colors.fit, readouts.line, { width: 2 }),
                ],
                [siAxis(colors, 'DUT supply', 'V'), siAxis(colors, 'Frequency', 'Hz', { size: 96 })],
              )
            }
          />
        ) : null}
      </div>
      <section className="key-figures" aria-label="Pushing figures" data-testid="pushing-figures">
        <h2>Supply pushing</h2>
        {!outcome.ok ? <p className="error-line">Analysis: {outcome.message}</p> : null}
        <dl className="figures">
          <FigureList figures={pushingKeyFigures(a)} />
        </dl>
      </section>
    </div>
  );
}
