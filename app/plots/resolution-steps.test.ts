import { describe, expect, it } from 'vitest';
import { readoutTicks, tickLabels } from './plot-options.ts';
import { celsiusReadout, counterReadout } from './readout.ts';
import { resolutionSteps } from './resolution-steps.ts';

/** uPlot's rule (uPlot 1.6 `findIncr`): the smallest step of the axis' list that leaves `space` px between ticks. */
function pickStep(steps: readonly number[], span: number, px: number, space: number): number {
  return steps.find((step) => (px * step) / span >= space) ?? NaN;
}

/** Place value of a label's last written digit in base units ("13.78 kHz" → 10). */
function lastDigitHz(label: string): number {
  const [, number = '', prefix = ''] = /^([\d.]+) (k?)Hz$/.exec(label) ?? [];
  const decimals = number.split('.')[1]?.length ?? 0;
  return 10 ** -decimals * (prefix === 'k' ? 1e3 : 1);
}

describe('value-axis tick steps follow the data resolution', () => {
  it('a 10 Hz counter (0.1 s gate, common practice: resolution 1/gate) steps 10, 20, 50, 100, 200, 250 Hz …', () => {
    expect(resolutionSteps(10)?.slice(0, 8)).toEqual([10, 20, 50, 100, 200, 250, 500, 1000]);
    // 0.3 s gate: 3.33 Hz counts; the first step that is not finer is 5 Hz, then whole hertz multiples.
    expect(resolutionSteps(1 / 0.3)?.slice(0, 4)).toEqual([5, 10, 20, 25]);
    expect(resolutionSteps(0.01)?.slice(0, 4)).toEqual([0.01, 0.02, 0.05, 0.1]);
    expect(resolutionSteps(null)).toBeNull();
    expect(resolutionSteps(0)).toBeNull();
  });

  it('a trace flipping between two counts 10 Hz apart gets 10 Hz ticks, written to 10 Hz, not 2 Hz ones', () => {
    // 13.78 kHz ± one count, a 24 Hz span on a 300 px axis with labels at least 30 px apart.
    const span = 24;
    const wanted = pickStep([1, 2, 2.5, 5, 10, 20, 25, 50], span, 300, 30);
    expect(wanted).toBe(2.5); // what a plain 1-2-2.5-5 list (uPlot's default) would draw: finer than a count
    const axis = readoutTicks(counterReadout(0.1));
    const steps = axis.incrs as number[];
    const step = pickStep(steps, span, 300, 30);
    expect(step).toBe(10);
    const labels = tickLabels([13770, 13780, 13790], step, 'Hz');
    expect(labels).toEqual(['13.77 kHz', '13.78 kHz', '13.79 kHz']);
    for (const label of labels) expect(lastDigitHz(label)).toBeGreaterThanOrEqual(10);
  });

  it('every offered step is a whole number of the resolution decade, so no label needs a finer digit', () => {
    for (const gateS of [1e-3, 0.02, 0.1, 0.25, 1, 10]) {
      const resolution = 1 / gateS;
      const decade = 10 ** Math.floor(Math.log10(resolution) + 1e-9);
      const steps = resolutionSteps(resolution) ?? [];
      expect(steps.length).toBeGreaterThan(20);
      for (const step of steps) {
        expect(step).toBeGreaterThanOrEqual(resolution * (1 - 1e-9));
        expect(Math.abs(step / decade - Math.round(step / decade))).toBeLessThan(1e-9);
      }
    }
    expect(readoutTicks(celsiusReadout).incrs).toEqual(resolutionSteps(0.01));
    // Without a resolution the axis keeps uPlot's own list.
    expect(readoutTicks(counterReadout(null))).toEqual({});
  });
});
