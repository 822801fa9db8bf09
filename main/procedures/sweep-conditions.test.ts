/**
 * A sweep records the conditions its figures were taken under — the DUT
 * supply voltage and the temperature — at the start (output on, before the
 * first point) and at the end (after the safe state), in events.jsonl and in
 * run.json, and a condition it cannot read is null, never a failed run.
 * Expected values are the simulated bench's own settings: DUT supply channel 2
 * on at the relaxation DUT's nominal 5.0 V (resources/duts/), ambient 23 °C
 * at the start of its default profile (main/sim/ambient.ts).
 */
import { describe, expect, it } from 'vitest';
import { assembleBench } from '../bench/assemble.ts';
import type { Supply, Thermometer } from '../instruments/roles.ts';
import { readRunFolder } from '../store/index.ts';
import { withTempDir } from '../store/testing/temp-dir.ts';
import { VirtualClock } from '../time/virtual-clock.ts';
import { recordSweep } from './recorded-run.ts';
import { runSweep } from './sweep.ts';
import { MemorySink } from './testing/fake-bench.ts';
import { SHORT_SWEEP_PLAN } from './testing/short-sweep-plan.ts';
import type { BenchRoles } from './types.ts';

const plan = SHORT_SWEEP_PLAN;

/** A sweep on the simulated relaxation DUT into a memory sink, with the bench's roles changed by `tweak`. */
async function simSweep(tweak: (bench: BenchRoles) => BenchRoles) {
  const clock = new VirtualClock({ autoAdvance: true });
  const bench = await assembleBench('sim', { clock, sim: { dut: 'relaxation' } });
  const sink = new MemorySink();
  const outcome = await runSweep({ bench: tweak(bench), plan, clock, sink });
  await bench.close();
  return { outcome, sink };
}

/** The same supply, but claiming it cannot measure voltage (a setpoint-only supply). */
function withoutMeasure(supply: Supply): Supply {
  return new Proxy(supply, {
    get(target, key) {
      if (key === 'capabilities') return { ...target.capabilities, measureVoltage: false };
      const value: unknown = Reflect.get(target, key, target);
      return typeof value === 'function' ? (value as (...args: unknown[]) => unknown).bind(target) : value;
    },
  });
}

describe('sweep conditions', () => {
  it('records the DUT supply and temperature at start and end in events.jsonl and run.json', async () => {
    await withTempDir(async (runsDir) => {
      const clock = new VirtualClock({ autoAdvance: true, startWallIso: '2026-12-02T09:00:00.000Z' });
      const bench = await assembleBench('sim', { clock, sim: { dut: 'relaxation' } });
      const recorded = await recordSweep({ bench, plan, clock, runsDir, dutId: 'sensor-osc-3' });
      await bench.close();
      expect(recorded.meta.status).toBe('complete');

      const run = await readRunFolder(recorded.dir);
      const types = run.events.map((e) => e.type);
      const conditions = run.events.filter((e) => e.type === 'conditions');
      expect(conditions.map((e) => e.phase)).toEqual(['start', 'end']);
      // Start: after the output is on, before the first point's reading; end: after the safe state, before `end`.
      const firstRowTimeS = Number(run.samplesCsv.split('\n')[1]?.split(',')[0]);
      expect(types.indexOf('conditions')).toBeGreaterThan(types.indexOf('output-on'));
      expect(conditions[0]?.time_s).toBeLessThanOrEqual(firstRowTimeS);
      expect(types.lastIndexOf('conditions')).toBeGreaterThan(types.lastIndexOf('safe-state'));
      expect(types.lastIndexOf('conditions')).toBe(types.indexOf('end') - 1);
      for (const event of conditions) {
        // Sim supply read-back noise is 0.3 mV rms; sensor noise 3 m°C rms on a 23 °C ± 1.5 °C / 6 h ambient.
        expect(event.dut_supply_v).toBeCloseTo(5, 2);
        expect(event.temperature_c).toBeCloseTo(23, 1);
      }

      const stored = run.meta.conditions;
      expect(stored).toBeDefined();
      expect(stored?.dutSupplyV.start).toBe(conditions[0]?.dut_supply_v);
      expect(stored?.dutSupplyV.end).toBe(conditions[1]?.dut_supply_v);
      expect(stored?.temperatureC.start).toBe(conditions[0]?.temperature_c);
      expect(stored?.temperatureC.end).toBe(conditions[1]?.temperature_c);
      expect(recorded.meta.conditions).toEqual(stored);
      // Additive: the contract's keys are all still there.
      expect(Object.keys(run.meta)).toEqual(
        expect.arrayContaining([
          'schema',
          'id',
          'kind',
          'status',
          'startedAt',
          'endedAt',
          'dut',
          'instruments',
          'plan',
          'software',
        ]),
      );
    });
  });

  it('reads the DUT supply setpoint when the supply cannot measure', async () => {
    const { outcome, sink } = await simSweep((bench) => ({ ...bench, supply: withoutMeasure(bench.supply) }));
    expect(outcome.status).toBe('complete');
    // The sim's channel 2 setpoint is exactly the DUT's nominal 5.0 V (no read-back noise).
    expect(outcome.conditions?.dutSupplyV).toEqual({ start: 5, end: 5 });
    expect(sink.eventsOfType('conditions').map((e) => e.dut_supply_v)).toEqual([5, 5]);
  });

  it('records null for a thermometer that fails or is absent, and the run still completes', async () => {
    const broken = (bench: BenchRoles): Thermometer => ({
      role: 'thermometer',
      identify: () => (bench.thermometer as Thermometer).identify(),
      readTemperature: () => Promise.reject(new Error('sensor open circuit')),
      close: () => Promise.resolve(),
    });
    const failing = await simSweep((bench) => ({ ...bench, thermometer: broken(bench) }));
    expect(failing.outcome.status).toBe('complete');
    expect(failing.outcome.failure).toBeNull();
    expect(failing.outcome.conditions?.temperatureC).toEqual({ start: null, end: null });
    expect(failing.outcome.conditions?.dutSupplyV.start).toBeCloseTo(5, 2);
    expect(failing.sink.eventsOfType('conditions').map((e) => e.temperature_c)).toEqual([null, null]);
    expect(failing.sink.eventsOfType('fault').filter((e) => e.operation === 'conditions-temperature')).toHaveLength(2);

    const absent = await simSweep((bench) => ({ ...bench, thermometer: undefined }));
    expect(absent.outcome.status).toBe('complete');
    expect(absent.outcome.conditions?.temperatureC).toEqual({ start: null, end: null });
  });
});
