import { describe, expect, it } from 'vitest';
import { VirtualClock } from '../time/virtual-clock.ts';
import { LineClient } from './line-client.ts';
import { createSimBench, type SimBenchOptions } from './sim-bench.ts';
import { SCPI_NAN_TEXT } from './sim-counter.ts';

async function setup(extra: Partial<SimBenchOptions> = {}) {
  const clock = new VirtualClock();
  const bench = createSimBench({
    clock,
    dut: 'relaxation',
    seed: 11,
    ambient: { kind: 'constant', temperatureC: 25 },
    ...extra,
  });
  const open = async (role: 'supply' | 'counter' | 'thermometer') => {
    const client = new LineClient(bench.transport(role));
    await client.transport.open();
    return client;
  };
  const supply = await open('supply');
  const counter = await open('counter');
  const q = (c: LineClient, command: string): Promise<string> => clock.runUntil(c.query(command));
  const send = async (c: LineClient, command: string): Promise<void> => {
    await c.send(command);
    await clock.advance(0);
  };
  return { clock, bench, supply, counter, q, send, open };
}

describe('simulated counter', () => {
  it('takes the gate time on the clock and answers in whole counts', async () => {
    const { clock, counter, supply, q, send } = await setup();
    await send(supply, 'SOUR1:VOLT 2.55;:OUTP1 ON');
    await send(counter, 'SENS:FREQ:APER 0.01');
    expect(await q(counter, 'FREQ:APER?')).toBe('+1.00000E-02');
    for (let i = 0; i < 10; i++) {
      const t0 = clock.now();
      const hz = Number(await q(counter, 'MEAS:FREQ?'));
      expect(clock.now() - t0).toBeCloseTo(0.01, 12);
      expect(hz * 0.01).toBeCloseTo(Math.round(hz * 0.01), 6);
    }
  });

  it('follows the control voltage (noise-free model within a few counts)', async () => {
    const { clock, bench, counter, supply, q, send } = await setup();
    await send(supply, 'OUTP1 ON');
    await send(counter, 'FREQ:GATE:TIME 1');
    for (const v of [2, 3, 4]) {
      await send(supply, `SOUR1:VOLT ${v}`);
      await clock.advance(0.1); // ≫ τ = 4 ms
      const truth = bench.dut.frequencyHzAt(clock.now());
      const hz = Number(await q(counter, 'READ?'));
      expect(Math.abs(hz - truth)).toBeLessThan(3 + truth * 5e-5);
    }
  });

  it('reports 9.91E37 below the stall edge by default', async () => {
    const { counter, supply, q, send } = await setup();
    await send(supply, 'SOUR1:VOLT 1.2;:OUTP1 ON');
    expect(await q(counter, 'MEAS:FREQ?')).toBe(SCPI_NAN_TEXT);
  });

  it('can report 0 instead', async () => {
    const { counter, q } = await setup({ counterNoSignal: 'zero' });
    expect(Number(await q(counter, 'MEAS:FREQ?'))).toBe(0);
  });

  it('can stay silent until the next message interrupts the query (-410)', async () => {
    const { clock, counter, q } = await setup({ counterNoSignal: 'silent' });
    await counter.send('MEAS:FREQ?');
    await clock.advance(5);
    expect(counter.buffered).toBe(0);
    expect(await q(counter, '*IDN?')).toBe('tunebench,SIM-COUNTER,0,0.1');
    expect(await q(counter, 'SYST:ERR?')).toBe('-410,"Query INTERRUPTED"');
  });

  it('supports INIT + FETCh? and flags FETCh? without INIT (-230)', async () => {
    const { counter, supply, q, send } = await setup();
    await send(supply, 'SOUR1:VOLT 3;:OUTP1 ON');
    await send(counter, 'FETC?');
    expect(await q(counter, 'SYST:ERR?')).toMatch(/^-230,/);
    await send(counter, 'INIT');
    expect(Number(await q(counter, 'FETC?'))).toBeGreaterThan(1000);
  });

  it('is deterministic for a seed', async () => {
    const run = async (seed: number): Promise<string[]> => {
      const { counter, supply, q, send } = await setup({ seed });
      await send(supply, 'SOUR1:VOLT 1.6;:OUTP1 ON');
      const out: string[] = [];
      for (let i = 0; i < 5; i++) out.push(await q(counter, 'MEAS:FREQ?'));
      return out;
    };
    expect(await run(3)).toEqual(await run(3));
    expect(await run(3)).not.toEqual(await run(4));
  });
});

describe('simulated thermometer', () => {
  it('reads the ambient profile in °C, and the DUT follows it (tempco)', async () => {
    const { clock, bench, open, q } = await setup({ ambient: { kind: 'ramp', startC: 20, ratePerHourC: 10 } });
    const thermo = await open('thermometer');
    expect(Number(await q(thermo, 'MEAS:TEMP?'))).toBeCloseTo(20, 1);
    bench.supply.device.connect().write('SOUR1:VOLT 2.55;:OUTP1 ON\n');
    await clock.advance(0.1);
    const f0 = bench.snapshot().dut;
    await clock.advance(3600);
    expect(Number(await q(thermo, 'MEAS:TEMP?'))).toBeCloseTo(30, 1);
    const f1 = bench.snapshot().dut;
    expect(f1.temperatureC).toBeCloseTo(30 + 10 * (0.1 / 3600), 9);
    // Tempco −180 ppm/°C about 25 °C, warm-up 450 ppm decaying with τ = 480 s; wander is a few ppm.
    const p = bench.dutParams;
    const scale0 = 1 + (p.tempcoPpmPerC * (f0.temperatureC - 25) + p.warmup.offsetPpm * Math.exp(-0.1 / 480)) * 1e-6;
    const scale1 = 1 + (p.tempcoPpmPerC * 5 + p.warmup.offsetPpm * Math.exp(-3600.1 / 480)) * 1e-6;
    expect((f1.frequencyHz / f0.frequencyHz - scale1 / scale0) / 1e-6).toBeCloseTo(0, -1);
  });
});
