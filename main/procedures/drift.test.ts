import { describe, expect, it } from 'vitest';
import { driftPlanSchema } from '../../app/contract/plans.ts';
import { DisconnectedError, TimeoutError } from '../instruments/errors.ts';
import { VirtualClock } from '../time/virtual-clock.ts';
import { runDrift } from './drift.ts';
import { RunControl } from './run-control.ts';
import { FakeThermometer, MemorySink, fakeBench } from './testing/fake-bench.ts';

function setup(durationS: number) {
  const clock = new VirtualClock();
  const bench = fakeBench(clock);
  const sink = new MemorySink();
  const plan = driftPlanSchema.parse({
    controlV: 1.5,
    intervalS: 1,
    durationS,
    gateS: 0.1,
    limits: { maxControlV: 5, currentLimitA: 0.05 },
  });
  return { clock, bench, sink, plan };
}

describe('runDrift', () => {
  it('logs one reading per interval with temperature, on slots that do not creep', async () => {
    const { clock, bench, sink, plan } = setup(600);
    const withThermo = { ...bench, thermometer: new FakeThermometer(clock) };
    const outcome = await clock.runUntil(runDrift({ bench: withThermo, plan, clock, sink }));
    expect(outcome.status).toBe('complete');
    expect(outcome.readings).toBe(600);
    expect(sink.rows).toHaveLength(600);
    // Toy DUT at 1.5 V: 200 kHz.
    expect(sink.rows.every((r) => r.frequency_hz === 200e3 && r.status === 'ok')).toBe(true);
    // Reading k ends one gate (0.1 s) after slot k: no creep over 600 slots.
    const last = sink.rows[599]?.time_s as number;
    const first = sink.rows[0]?.time_s as number;
    expect(last - first).toBeCloseTo(599, 6);
    // FakeThermometer reads 25 + sin(t / 1 h) °C: over this ten-minute log, between 25 and 25 + sin(1/6) ≈ 25.166 °C.
    for (const row of sink.rows) {
      expect(row.temperature_c).toBeGreaterThanOrEqual(25);
      expect(row.temperature_c).toBeLessThanOrEqual(25 + Math.sin(700 / 3600));
    }
    expect(bench.supply.channel(1)).toMatchObject({ voltageV: 0, output: false });
  });

  it('a stop ends the log as complete, with the safe state', async () => {
    const { clock, bench, sink, plan } = setup(3600);
    const control = new RunControl();
    clock.setTimer(100.5, () => control.stop('signal'));
    const outcome = await clock.runUntil(runDrift({ bench, plan, clock, sink, control }));
    expect(outcome.status).toBe('complete');
    expect(outcome.reason).toBe('signal');
    expect(outcome.readings).toBe(101); // slots at 0, 1, …, 100 s
    expect(Number.isNaN(sink.rows[0]?.temperature_c)).toBe(true); // no thermometer on this bench
    expect(bench.supply.channel(1)).toMatchObject({ voltageV: 0, output: false });
  });

  it('survives a dropped counter link: gap recorded, link reopened, logging resumes', async () => {
    const { clock, bench, sink, plan } = setup(300);
    let down = false;
    bench.counter.override = (i) => {
      if (i === 50) down = true;
      return down ? new DisconnectedError('tcp://127.0.0.1:5026') : null;
    };
    let attempts = 0;
    bench.reconnect = async () => {
      attempts++;
      if (attempts < 10) throw new DisconnectedError('tcp://127.0.0.1:5026', 'connection refused');
      down = false;
    };
    const outcome = await clock.runUntil(runDrift({ bench, plan, clock, sink }));
    expect(outcome.status).toBe('complete');
    expect(outcome.gaps).toBe(1);
    expect(sink.eventsOfType('reconnect-failed')).toHaveLength(9);
    const gapEnd = sink.eventsOfType('gap-end')[0];
    expect(gapEnd?.missed_slots).toBe(10);
    expect(gapEnd?.duration_s as number).toBeGreaterThan(9.9);
    expect(sink.rows).toHaveLength(290);
  });

  it('records failed readings and treats a silent counter as a gap', async () => {
    const { clock, bench, sink, plan } = setup(100);
    bench.counter.override = (i) => (i >= 20 && i < 25 ? new TimeoutError('MEAS:FREQ?', 2) : null);
    let reconnects = 0;
    bench.reconnect = async () => {
      reconnects++;
    };
    const outcome = await clock.runUntil(runDrift({ bench, plan, clock, sink }));
    expect(outcome.status).toBe('complete');
    expect(sink.rows.filter((r) => r.status === 'timeout').length).toBeGreaterThanOrEqual(3);
    expect(sink.eventsOfType('fault').length).toBe(sink.rows.filter((r) => r.status === 'timeout').length);
    expect(sink.eventsOfType('gap-start')[0]?.cause).toBe('not-answering');
    expect(reconnects).toBeGreaterThanOrEqual(1);
    expect(sink.eventsOfType('gap-end')).toHaveLength(1);
  });
});
