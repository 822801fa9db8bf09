/**
 * The chamber driver against the simulated chamber through the shipped
 * chamber-scpi profile: limits refused before anything is sent, setpoints
 * read back, run/stop and ramp as the profile maps them.
 */
import { afterEach, describe, expect, it } from 'vitest';
import { createSimBench, type SimBench } from '../sim/index.ts';
import { VirtualClock } from '../time/virtual-clock.ts';
import { ChamberLimitError, checkChamberLimits } from './chamber-driver.ts';
import { openInstrument } from './open-instrument.ts';
import type { RoleName } from './roles.ts';

let sim: SimBench | null = null;
afterEach(() => {
  sim?.close();
  sim = null;
});

async function openChamber() {
  const clock = new VirtualClock();
  sim = createSimBench({ clock });
  const bench = sim;
  const chamber = await openInstrument(
    'chamber',
    { address: 'sim' },
    { clock, sim: (role: RoleName) => bench.transport(role) },
  );
  return { chamber, bench, clock };
}

describe('chamber driver', () => {
  it('refuses setpoint and ramp writes until limits are set, and outside them, before sending', async () => {
    const { chamber, bench } = await openChamber();
    const before = bench.snapshot().chamber.setpointC;
    await expect(chamber.setSetpoint(40)).rejects.toThrow(/no limits set on the chamber \(sim\)/);
    chamber.setLimits({ minC: -20, maxC: 70, maxRateCPerMin: 2 });
    await expect(chamber.setSetpoint(85)).rejects.toThrow(ChamberLimitError);
    await expect(chamber.setSetpoint(85)).rejects.toThrow(
      /85 °C refused by the chamber \(sim, profile chamber-scpi\); valid: -20 … 70 °C/,
    );
    await expect(chamber.setRampRate(5)).rejects.toThrow(/5 °C\/min refused.*valid: > 0 … 2 °C\/min/);
    expect(bench.snapshot().chamber.setpointC).toBe(before);
    expect(bench.snapshot().chamber.rampCPerMin).toBe(5); // the simulator's own default, untouched
  });

  it('sets, reads back, ramps, runs and stops the simulated chamber', async () => {
    const { chamber, bench } = await openChamber();
    chamber.setLimits({ minC: -40, maxC: 85, maxRateCPerMin: 3 });
    expect((await chamber.identify()).model).toBe('SIM-CHAMBER');
    await chamber.setRampRate(2.5);
    await chamber.setSetpoint(-15.5);
    expect(await chamber.getSetpoint()).toBe(-15.5);
    await chamber.setRunning(true);
    expect(await chamber.getRunning()).toBe(true);
    expect(bench.snapshot().chamber).toMatchObject({ running: true, setpointC: -15.5, rampCPerMin: 2.5 });
    await chamber.setRunning(false);
    expect(bench.snapshot().chamber.running).toBe(false);
    expect(Math.abs((await chamber.readAirTemperature()) - bench.snapshot().chamber.airC)).toBeLessThan(0.15);
  });

  it('reports a setpoint the chamber refused (its own range is narrower than the limits)', async () => {
    const { chamber, bench } = await openChamber();
    chamber.setLimits({ minC: -100, maxC: 200, maxRateCPerMin: 3 });
    // The simulated chamber's own range ends at −70 °C: it refuses −80 (−222) and keeps its old setpoint.
    await expect(chamber.setSetpoint(-80)).rejects.toThrow(/-222|out of range/i);
    expect(bench.snapshot().chamber.setpointC).not.toBe(-80);
  });

  it('checks the limits themselves', () => {
    expect(() => checkChamberLimits({ minC: 50, maxC: 20, maxRateCPerMin: 1 })).toThrow(/chamber\.minC/);
    expect(() => checkChamberLimits({ minC: -20, maxC: 20, maxRateCPerMin: 0 })).toThrow(/chamber\.maxRateCPerMin/);
  });
});
