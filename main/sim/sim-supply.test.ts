import { describe, expect, it } from 'vitest';
import { VirtualClock } from '../time/virtual-clock.ts';
import { LineClient } from './line-client.ts';
import { createSimBench } from './sim-bench.ts';

async function setup() {
  const clock = new VirtualClock();
  const bench = createSimBench({ clock, dut: 'relaxation', seed: 5 });
  const client = new LineClient(bench.transport('supply'));
  await client.transport.open();
  const q = (command: string): Promise<string> => clock.runUntil(client.query(command));
  const send = async (command: string): Promise<void> => {
    await client.send(command);
    await clock.advance(0);
  };
  return { clock, bench, client, q, send };
}

describe('simulated supply', () => {
  it('identifies itself as simulated and has an empty error queue', async () => {
    const { q } = await setup();
    expect(await q('*IDN?')).toBe('tunebench,SIM-SUPPLY,0,0.1');
    expect(await q('SYST:ERR?')).toBe('0,"No error"');
  });

  it('pushes -113 for an unknown header and sets ESR bit 5 (IEEE 488.2 command error bit CME, from memory)', async () => {
    const { q, send } = await setup();
    await send('FOO:BAR 1');
    expect(await q('SYST:ERR?')).toBe('-113,"Undefined header"');
    expect(await q('SYST:ERR?')).toBe('0,"No error"');
    await send('BOGUS');
    expect(await q('*ESR?')).toBe('32');
    expect(await q('*ESR?')).toBe('0');
    await send('*CLS');
    expect(await q('SYST:ERR?')).toBe('0,"No error"');
  });

  it('starts with channel 2 on at the DUT nominal supply and channel 1 off', async () => {
    const { bench } = await setup();
    expect(bench.supply.state(2)).toMatchObject({ outputOn: true, setpointV: 5, outputV: 5 });
    expect(bench.supply.state(1)).toMatchObject({ outputOn: false, setpointV: 0, outputV: 0 });
  });

  it('quantises setpoints to 1 mV and accepts long/short/any-case/suffixed forms', async () => {
    const { q, send, bench } = await setup();
    await send('source1:voltage:level:immediate:amplitude 1.234567');
    expect(await q('SOUR1:VOLT?')).toBe('+1.23500E+00');
    await send('SOUR2:VOLT 4.5;CURR 0.05');
    expect(bench.supply.state(2)).toMatchObject({ setpointV: 4.5, currentLimitA: 0.05 });
    await send('INST:NSEL 2;:VOLT 4.8');
    expect(bench.supply.state(2).setpointV).toBeCloseTo(4.8, 12);
    await send('INST:SEL OUT1');
    await send('VOLT 750mV');
    expect(bench.supply.state(1).setpointV).toBeCloseTo(0.75, 12);
    expect(await q('INST:SEL?')).toBe('OUT1');
  });

  it('rejects out-of-range setpoints with -222 and bad channels with -114', async () => {
    const { q, send, bench } = await setup();
    await send('SOUR1:VOLT 25');
    expect(await q('SYST:ERR?')).toMatch(/^-222,"Data out of range/);
    expect(bench.supply.state(1).setpointV).toBe(0);
    await send('SOUR3:VOLT 1');
    expect(await q('SYST:ERR?')).toMatch(/^-114,/);
    await send('VOLT');
    expect(await q('SYST:ERR?')).toMatch(/^-109,/);
  });

  it('over-voltage protection trips the output off and pushes an error', async () => {
    const { q, send, bench } = await setup();
    await send('SOUR1:VOLT:PROT 5;:SOUR1:VOLT 4;:OUTP1 ON');
    expect(bench.supply.state(1)).toMatchObject({ outputOn: true, ovpTripped: false });
    await send('SOUR1:VOLT 6');
    expect(bench.supply.state(1)).toMatchObject({ outputOn: false, ovpTripped: true, setpointV: 6 });
    expect(await q('SYST:ERR?')).toMatch(/^-221,"Settings conflict;over-voltage protection tripped/);
    await send('SOUR1:VOLT 4;:OUTP1 ON');
    expect(bench.supply.state(1).outputOn).toBe(false);
    expect(await q('SYST:ERR?')).toMatch(/^-221,/);
    await send('OUTP1:PROT:CLE;:OUTP1 ON');
    expect(bench.supply.state(1)).toMatchObject({ outputOn: true, ovpTripped: false });
    expect(await q('OUTP1?')).toBe('1');
  });

  it('measured output slews toward the setpoint', async () => {
    const { q, send, clock } = await setup();
    await send('SOUR1:VOLT 2;:OUTP1 ON');
    const t0 = clock.now();
    await clock.advance(0.001); // 1 V/ms slew: halfway
    const mid = Number(await q('MEAS1:VOLT?'));
    expect(mid).toBeGreaterThan(0.9);
    expect(mid).toBeLessThan(1.1);
    await clock.advance(0.01);
    expect(Number(await q('MEAS1:VOLT?'))).toBeCloseTo(2, 2);
    expect(clock.now() - t0).toBeCloseTo(0.011, 9);
  });

  it('goes constant-current when the load would draw more than the limit', async () => {
    const { q, send, bench } = await setup();
    // Channel 1 load is the tuning port, 100 kΩ: 10 µA limit → 1 V.
    await send('SOUR1:CURR 10e-6;:SOUR1:VOLT 3;:OUTP1 ON');
    await (bench.clock as VirtualClock).advance(0.1);
    expect(bench.supply.state(1).mode).toBe('CC');
    expect(Number(await q('MEAS1:VOLT?'))).toBeCloseTo(1, 2);
    expect(Number(await q('MEAS1:CURR?'))).toBeCloseTo(1e-5, 5);
  });

  it('*RST returns to the power-on state', async () => {
    const { send, bench, q } = await setup();
    await send('SOUR2:VOLT 3;:SOUR1:VOLT 2;:OUTP1 ON');
    await send('*RST');
    expect(bench.supply.state(1)).toMatchObject({ outputOn: false, setpointV: 0 });
    expect(bench.supply.state(2)).toMatchObject({ outputOn: true, setpointV: 5 });
    expect(await q('*OPC?')).toBe('1');
  });
});
