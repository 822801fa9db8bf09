import { describe, expect, it } from 'vitest';
import { pushingPlanSchema } from '../../app/contract/plans.ts';
import { InstrumentError } from '../instruments/errors.ts';
import { VirtualClock } from '../time/virtual-clock.ts';
import { LimitsError } from './limits.ts';
import { runPushing } from './pushing.ts';
import { MemorySink, TOY_DUT, fakeBench } from './testing/fake-bench.ts';

function setup(overrides: Record<string, unknown> = {}) {
  const clock = new VirtualClock();
  // Toy DUT: 200 kHz at 1.5 V, pushed by +2 kHz per volt of DUT supply.
  const bench = fakeBench(clock, { ...TOY_DUT, pushingHzPerV: 2000 });
  bench.supply.channel(2).voltageV = 3.3;
  bench.supply.channel(2).output = true;
  const sink = new MemorySink();
  const plan = pushingPlanSchema.parse({
    controlV: 1.5,
    supplyStartV: 3.0,
    supplyStopV: 3.6,
    supplyStepV: 0.1,
    readingsPerPoint: 3,
    gateS: 0.1,
    settleS: 0.2,
    maxSupplyV: 3.6,
    limits: { maxControlV: 5, currentLimitA: 0.05 },
    ...overrides,
  });
  return { clock, bench, sink, plan };
}

describe('runPushing', () => {
  it('steps the DUT supply and reports Hz/V and ppm/V, then puts the supply back', async () => {
    const { clock, bench, sink, plan } = setup();
    const outcome = await clock.runUntil(runPushing({ bench, plan, clock, sink }));
    expect(outcome.status).toBe('complete');
    expect(outcome.steps).toBe(7);
    expect(sink.rows).toHaveLength(21);
    // Quantised to 10 Hz (gate 0.1 s), the slope is 2000 Hz/V to within a count per 0.6 V span.
    expect(outcome.hzPerV).toBeCloseTo(2000, -1);
    expect(outcome.ppmPerV).toBeCloseTo((2000 / 200e3) * 1e6, -1); // 10 000 ppm/V
    expect(bench.supply.channel(2)).toMatchObject({ voltageV: 3.3, output: true });
    expect(bench.supply.channel(1)).toMatchObject({ voltageV: 0, output: false });
  });

  it('refuses a supply range above maxSupplyV before any write', async () => {
    const { clock, bench, sink, plan } = setup({ supplyStopV: 4 });
    await expect(runPushing({ bench, plan, clock, sink })).rejects.toThrow(LimitsError);
    await expect(runPushing({ bench, plan, clock, sink })).rejects.toThrow(
      /supplyStopV: 4 V exceeds maxSupplyV \(3.6 V\)/,
    );
    expect(bench.supply.log).toEqual([]);
  });

  it('an instrument error mid-way aborts with both channels made safe', async () => {
    const { clock, bench, sink, plan } = setup();
    bench.supply.failWith = (op, ch, value) =>
      op === 'setVoltage' && ch === 2 && Math.abs((value as number) - 3.4) < 1e-9
        ? new InstrumentError([{ code: -222, message: 'Data out of range' }])
        : null;
    const outcome = await clock.runUntil(runPushing({ bench, plan, clock, sink }));
    expect(outcome.status).toBe('aborted');
    expect(outcome.failure?.kind).toBe('instrument-error');
    expect(bench.supply.channel(2).voltageV).toBe(3.3);
    expect(bench.supply.channel(1).output).toBe(false);
  });
});
