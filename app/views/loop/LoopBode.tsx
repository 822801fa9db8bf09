/**
 * The loop's Bode plots: open-loop gain and phase at each Kvco corner, with
 * each corner's crossover and phase margin marked and a key saying what the
 * marks are.
 */
import type uPlot from 'uplot';
import { PlotPanel } from '../../plots/PlotPanel.tsx';
import { bodeOptions, degreesText, type BodeCorner, type BodeKind } from './bode-options.ts';
import { formatFigure } from '../../analysis/format-figure.ts';

export interface LoopBodeProps {
  /** Rebuilds the plots when it changes (run, theme, inputs). */
  buildKey: string;
  freqs: Float64Array;
  /** One response per corner, in the corners' order. */
  responses: readonly { magnitudeDb: Float64Array; phaseDeg: Float64Array }[];
  corners: readonly BodeCorner[];
}

/** uPlot reads null as a gap; NaN (log of a non-positive gain) would break its ranging. */
function finiteOrNull(values: Float64Array): (number | null)[] {
  return Array.from(values, (v) => (Number.isFinite(v) ? v : null));
}

function MarksKey({ kind, corners }: { kind: BodeKind; corners: readonly BodeCorner[] }) {
  return (
    <>
      <span className="mark-key" data-testid={`loop-${kind}-key-crossover`}>
        ┆ crossover, where the loop gain is 1 (0 dB):{' '}
        {corners.map((c) => `${c.label} ${formatFigure(c.crossoverHz, 'Hz', { digits: 3 })}`).join(' · ')}
      </span>
      {kind === 'phase' ? (
        <span className="mark-key" data-testid="loop-phase-key-margin">
          ▮ phase margin, from −180° up to the phase at crossover:{' '}
          {corners.map((c) => `${c.label} ${degreesText(c.phaseMarginDeg)}`).join(' · ')}
        </span>
      ) : (
        <span className="mark-key">dotted: 0 dB</span>
      )}
    </>
  );
}

export function LoopBode(props: LoopBodeProps) {
  const panel = (kind: BodeKind, title: string, height: number) => (
    <PlotPanel
      testId={`loop-${kind === 'magnitude' ? 'magnitude' : 'phase'}-plot`}
      title={title}
      buildKey={`${props.buildKey}|${kind}`}
      height={height}
      data={() =>
        [
          Array.from(props.freqs),
          ...props.responses.map((r) => finiteOrNull(kind === 'magnitude' ? r.magnitudeDb : r.phaseDeg)),
        ] as uPlot.AlignedData
      }
      options={(colors, width, plotHeight) => bodeOptions(kind, props.corners, colors, width, plotHeight)}
      footer={<MarksKey kind={kind} corners={props.corners} />}
    />
  );
  return (
    <>
      {panel('magnitude', 'Open-loop gain', 240)}
      {panel('phase', 'Open-loop phase', 220)}
    </>
  );
}
