/**
 * The simulated bench driven the way procedures drive it: the shipped
 * profiles and role drivers (main/instruments/) over in-process transports,
 * on a VirtualClock auto-advanced with runUntil.
 */
import { describe, expect, it } from 'vitest';
import { openInstrument } from '../instruments/open-instrument.ts';
import type { RoleName } from '../instruments/roles.ts';
import { VirtualClock } from '../time/virtual-clock.ts';
import { createSimBench, type SimBenchOptions } from './sim-bench.ts';

async function openAll(extra: Partial<SimBenchOptions> = {}) {
  const clock = new VirtualClock();
  const bench = createSimBench({ clock, seed: 21, ...extra });
  const options = { clock, sim: (role: RoleName) => bench.transport(role) };
  const [supply, counter, thermometer] = await clock.runUntil(
    Promise.all([
      openInstrument('supply', { address: 'sim' }, options),
      openInstrument('counter', { address: 'sim' }, options),
      openInstrument('thermometer', { address: 'sim' }, options),
    ]),
  );
  return { clock, bench, supply, counter, thermometer };
}

describe('role drivers on the simulated bench (virtual time)', () => {
  it('sweeps the relaxation DUT down through its stall edge', async () => {
    const { clock, bench, supply, counter } = await openAll();
    const readings = await clock.runUntil(
      (async () => {
        await supply.setCurrentLimit(1, 0.01);
        await supply.setVoltage(1, 4);
        await supply.setOutput(1, true);
        await counter.setGate(0.1);
        const out: { v: number; status: string; hz: number }[] = [];
        for (let v = 4; v >= 1.2; v -= 0.4) {
          await supply.setVoltage(1, v);
          await clock.sleep(0.05);
          const r = await counter.readFrequency();
          out.push({ v, status: r.status, hz: r.status === 'ok' ? r.frequencyHz : 0 });
        }
        return out;
      })(),
    );
    const ok = readings.filter((r) => r.status === 'ok');
    for (let i = 1; i < ok.length; i++)
      expect((ok[i] as { hz: number }).hz).toBeLessThan((ok[i - 1] as { hz: number }).hz);
    // Stall edge at 1.55 V (Vc = V1): points at 1.6 V and above oscillate, 1.2 V does not.
    expect(readings.filter((r) => r.v > 1.55).every((r) => r.status === 'ok')).toBe(true);
    expect(readings.filter((r) => r.v < 1.5).every((r) => r.status === 'no-signal')).toBe(true);
    expect(bench.supply.state(1)).toMatchObject({ outputOn: true, setpointV: expect.closeTo(1.2, 3) });
  });

  it('a counter that stays silent with no signal reads as a timeout, on virtual time', async () => {
    const { clock, counter } = await openAll({ counterNoSignal: 'silent' });
    const t0 = clock.now();
    const reading = await clock.runUntil(counter.readFrequency());
    expect(reading).toEqual({ status: 'no-signal', cause: 'timeout' });
    expect(clock.now() - t0).toBeGreaterThanOrEqual(0.1);
  });
});
