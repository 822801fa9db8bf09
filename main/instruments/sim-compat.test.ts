/**
 * The shipped standard-SCPI profiles against the simulated bench in main/sim/
 * (through its public index): proves the profiles, drivers and sim speak the
 * same command tree.
 */
import { afterEach, describe, expect, it } from 'vitest';
import { createSimBench, type SimBench } from '../sim/index.ts';
import { RealClock } from '../time/real-clock.ts';
import { InstrumentError } from './errors.ts';
import { openInstrument } from './open-instrument.ts';
import type { RoleName } from './roles.ts';

let bench: SimBench | null = null;
afterEach(() => {
  bench?.close();
  bench = null;
});

describe('shipped profiles on the simulated bench', () => {
  it('identify, set, read back, count, read temperature and report a refused setpoint', async () => {
    const clock = new RealClock();
    const simBench = createSimBench({ clock });
    bench = simBench;
    const options = { clock, sim: (role: RoleName) => simBench.transport(role) };
    const supply = await openInstrument('supply', { address: 'sim' }, options);
    const counter = await openInstrument('counter', { address: 'sim:counter' }, options);
    const thermometer = await openInstrument('thermometer', { address: 'sim' }, options);
    expect((await supply.identify()).model).toBe('SIM-SUPPLY');
    expect((await counter.identify()).model).toBe('SIM-COUNTER');
    await supply.setCurrentLimit(1, 0.05);
    await supply.setVoltage(1, 2.5);
    await supply.setOutput(1, true);
    expect(await supply.getVoltageSetpoint(1)).toBe(2.5);
    expect(await supply.getOutput(1)).toBe(true);
    await counter.setGate(0.1);
    await clock.sleep(0.3);
    const reading = await counter.readFrequency();
    expect(reading.status).toBe('ok');
    const temperatureC = await thermometer.readTemperature();
    expect(temperatureC).toBeGreaterThan(-50);
    expect(temperatureC).toBeLessThan(150);
    const refused = await supply.setVoltage(1, 99).catch((e: unknown) => e);
    expect(refused).toBeInstanceOf(InstrumentError);
    expect((refused as InstrumentError).code).toBe(-222);
    await Promise.all([supply.close(), counter.close(), thermometer.close()]);
  });
});
