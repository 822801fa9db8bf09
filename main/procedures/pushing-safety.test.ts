/**
 * Pushing's safety on the DUT supply channel: over-voltage protection set
 * (maxSupplyV + margin) before the first step, and the DUT supply put back
 * where it was found on every way out — checked against the fake supply's
 * own state and, end to end, against the simulated supply's.
 */
import { describe, expect, it } from 'vitest';
import { pushingPlanSchema } from '../../app/contract/plans.ts';
import { assembleBench } from '../bench/assemble.ts';
import { DisconnectedError, InstrumentError } from '../instruments/errors.ts';
import { VirtualClock } from '../time/virtual-clock.ts';
import { dutSupplyOvpLevelV, runPushing } from './pushing.ts';
import { RunControl } from './run-control.ts';
import { MemorySink, TOY_DUT, fakeBench } from './testing/fake-bench.ts';

const PLAN = {
  controlV: 1.5,
  supplyStartV: 3.0,
  supplyStopV: 3.6,
  supplyStepV: 0.1,
  readingsPerPoint: 2,
  gateS: 0.1,
  settleS: 0.2,
  maxSupplyV: 3.6,
  limits: { maxControlV: 5, currentLimitA: 0.05 },
};

function setup(found: { volts: number; on: boolean } = { volts: 3.3, on: true }) {
  const clock = new VirtualClock();
  const bench = fakeBench(clock, { ...TOY_DUT, pushingHzPerV: 2000 });
  bench.supply.channel(2).voltageV = found.volts;
  bench.supply.channel(2).output = found.on;
  const sink = new MemorySink();
  const plan = pushingPlanSchema.parse(PLAN);
  return { clock, bench, sink, plan };
}

describe('pushing: over-voltage protection on the DUT supply', () => {
  it('sets OVP on the DUT supply channel (maxSupplyV + 5 %) before the first step', async () => {
    const { clock, bench, sink, plan } = setup();
    const outcome = await clock.runUntil(runPushing({ bench, plan, clock, sink }));
    expect(outcome.status).toBe('complete');
    const ovpV = dutSupplyOvpLevelV(3.6);
    expect(ovpV).toBeCloseTo(3.78, 9);
    const log = bench.supply.log;
    const ovpAt = log.indexOf(`setOverVoltageProtection 2 ${ovpV}`);
    const firstStepAt = log.findIndex((line) => line.startsWith('setVoltage 2 '));
    expect(ovpAt).toBeGreaterThanOrEqual(0);
    expect(ovpAt).toBeLessThan(firstStepAt);
    expect(bench.supply.channel(2).ovpV).toBe(ovpV);
    expect(sink.eventsOfType('limits')[0]?.dutSupplyOvpV).toBe(ovpV);
  });

  it('a supply without OVP is allowed and recorded as such', async () => {
    const { clock, bench, sink, plan } = setup();
    (bench.supply.capabilities as { overVoltageProtection: boolean }).overVoltageProtection = false;
    const outcome = await clock.runUntil(runPushing({ bench, plan, clock, sink }));
    expect(outcome.status).toBe('complete');
    expect(bench.supply.log.some((line) => line.startsWith('setOverVoltageProtection'))).toBe(false);
    expect(sink.eventsOfType('limits')[0]?.dutSupplyOvpV).toBeNull();
  });

  it('refuses, changing nothing, when the DUT supply is found above maxSupplyV + margin (OVP would trip it)', async () => {
    const { clock, bench, sink, plan } = setup({ volts: 4.2, on: true });
    const outcome = await clock.runUntil(runPushing({ bench, plan, clock, sink }));
    expect(outcome.status).toBe('aborted');
    expect(outcome.failure?.kind).toBe('limits');
    expect(outcome.failure?.message).toMatch(/maxSupplyV: .*4\.2 V, above maxSupplyV \(3\.6 V\)/);
    expect(bench.supply.log.some((line) => line.startsWith('setOverVoltageProtection 2'))).toBe(false);
    expect(
      bench.supply.log.filter((line) => line.startsWith('setVoltage 2 ')).every((line) => line === 'setVoltage 2 4.2'),
    ).toBe(true);
    expect(bench.supply.channel(2)).toMatchObject({ voltageV: 4.2, output: true });
    expect(bench.supply.channel(1).output).toBe(false);
  });
});

describe('pushing: the DUT supply is put back on every way out', () => {
  type Way = {
    name: string;
    arrange: (ctx: ReturnType<typeof setup>) => RunControl | undefined;
    status: 'complete' | 'aborted';
  };
  const ways: Way[] = [
    { name: 'completion', arrange: () => undefined, status: 'complete' },
    {
      name: 'operator stop mid-way',
      arrange: ({ clock }) => {
        const control = new RunControl();
        clock.setTimer(1.0, () => control.stop('stop'));
        return control;
      },
      status: 'aborted',
    },
    {
      name: 'pause timeout',
      arrange: ({ clock }) => {
        const control = new RunControl({ pauseTimeoutS: 5 });
        clock.setTimer(0.7, () => control.pause());
        return control;
      },
      status: 'aborted',
    },
    {
      name: 'instrument error on a step',
      arrange: ({ bench }) => {
        bench.supply.failWith = (op, ch, value) =>
          op === 'setVoltage' && ch === 2 && Math.abs((value as number) - 3.2) < 1e-9
            ? new InstrumentError([{ code: -222, message: 'Data out of range' }])
            : null;
        return undefined;
      },
      status: 'aborted',
    },
    {
      name: 'counter link lost (no reconnect)',
      arrange: ({ bench }) => {
        bench.counter.override = (i) => (i >= 5 ? new DisconnectedError('tcp://127.0.0.1:5026') : null);
        return undefined;
      },
      status: 'aborted',
    },
    {
      name: 'a bug (TypeError) in a reading',
      arrange: ({ bench }) => {
        bench.counter.override = (i) => (i === 7 ? new TypeError('cannot read properties of undefined') : null);
        return undefined;
      },
      status: 'aborted',
    },
  ];

  for (const found of [
    { volts: 3.3, on: true },
    { volts: 3.45, on: false },
  ]) {
    for (const way of ways) {
      it(`${way.name}: DUT supply back to ${found.volts} V, output ${found.on ? 'on' : 'off'}; control channel safe`, async () => {
        const ctx = setup(found);
        const control = way.arrange(ctx);
        const { clock, bench, sink, plan } = ctx;
        const outcome = await clock.runUntil(runPushing({ bench, plan, clock, sink, ...(control ? { control } : {}) }));
        expect(outcome.status).toBe(way.status);
        expect(bench.supply.channel(2)).toMatchObject({ voltageV: found.volts, output: found.on });
        expect(bench.supply.channel(1)).toMatchObject({ voltageV: 0, output: false });
        expect(
          sink.events.some((e) => e.type === 'safe-state' && e.step === 'dut-supply-restore' && e.ok === true),
        ).toBe(true);
        expect(outcome.safeStateOk).toBe(true);
      });
    }
  }
});

describe('pushing on the simulated bench', () => {
  it(
    'sets OVP on the DUT supply, steps it, and leaves it where it was found (simulator state)',
    { timeout: 60_000 },
    async () => {
      const clock = new VirtualClock({ autoAdvance: true });
      const bench = await assembleBench('sim', { clock, sim: { dut: 'relaxation', seed: 4 } });
      const sim = bench.sim;
      if (sim === null) throw new Error('expected the simulated bench');
      const before = sim.supply.state(2); // the relaxation DUT runs from 5 V, on since power-up
      const plan = pushingPlanSchema.parse({
        ...PLAN,
        controlV: 3,
        supplyStartV: 4.5,
        supplyStopV: 5.5,
        supplyStepV: 0.25,
        maxSupplyV: 5.5,
        limits: { maxControlV: 5, currentLimitA: 0.02 },
      });
      const sink = new MemorySink();
      const outcome = await runPushing({ bench, plan, clock, sink });
      await bench.close();
      expect(outcome.status).toBe('complete');
      expect(outcome.steps).toBe(5);
      const after = sim.supply.state(2);
      expect(after.ovpV).toBeCloseTo(dutSupplyOvpLevelV(5.5), 6);
      expect(after.ovpTripped).toBe(false);
      expect(after.setpointV).toBe(before.setpointV);
      expect(after.outputOn).toBe(before.outputOn);
      expect(sim.supply.state(1)).toMatchObject({ outputOn: false, setpointV: 0 });
    },
  );
});
