import { describe, expect, it } from 'vitest';
import { VirtualClock } from '../time/virtual-clock.ts';
import { fileURLToPath } from 'node:url';
import { loadFaultScriptFile } from '../cli/sim-files.ts';
import { parseFaultScript, type FaultSpec } from './faults.ts';
import { LineClient } from './line-client.ts';
import { createSimBench } from './sim-bench.ts';
import type { z } from 'zod';
import type { faultSchema } from './faults.ts';

type FaultInput = z.input<typeof faultSchema>;

async function setup(faults: FaultInput[]) {
  const clock = new VirtualClock();
  const bench = createSimBench({ clock, seed: 2, faults });
  const counter = new LineClient(bench.transport('counter'));
  await counter.transport.open();
  const q = (command: string): Promise<string> => clock.runUntil(counter.query(command));
  return { clock, bench, counter, q };
}

describe('fault script schema', () => {
  it('names the missing or conflicting field', async () => {
    expect(() => parseFaultScript({ faults: [{ device: 'counter', type: 'delay', atS: 1 }] }, 'f.json')).toThrow(
      /f\.json.*faults\.0\.delayS/,
    );
    expect(() => parseFaultScript({ faults: [{ device: 'counter', type: 'drop', atS: 1, atReading: 2 }] })).toThrow(
      /exactly one of atS or atReading/,
    );
    expect(() => parseFaultScript({ faults: [{ device: 'oven', type: 'drop', atS: 1 }] })).toThrow(/faults\.0\.device/);
    const example = loadFaultScriptFile(fileURLToPath(new URL('./fault-script.example.json', import.meta.url)));
    await expect(example).resolves.toMatchObject({
      faults: expect.arrayContaining([expect.objectContaining({ type: 'silence', durationS: 10 })]),
    });
    const ok = parseFaultScript({ faults: [{ device: 'counter', type: 'garbage', atReading: 3 }] });
    expect((ok.faults[0] as Extract<FaultSpec, { type: 'garbage' }>).count).toBe(1);
  });
});

describe('faults on the in-process transport', () => {
  it('drop at a time: the host sees close with a reason, and can reconnect', async () => {
    const { clock, counter, q } = await setup([{ device: 'counter', type: 'drop', atS: 10 }]);
    expect(await q('*IDN?')).toMatch(/SIM-COUNTER/);
    await clock.advance(10);
    expect(counter.closedWith).toBeInstanceOf(Error);
    expect(counter.transport.isOpen).toBe(false);
    await expect(counter.transport.write('*IDN?\n')).rejects.toThrow(/not open/);
    await counter.transport.open();
    expect(await q('*IDN?')).toMatch(/SIM-COUNTER/);
  });

  it('drop at a reading', async () => {
    const { clock, counter, q } = await setup([{ device: 'counter', type: 'drop', atReading: 2 }]);
    // Reading 1 is answered, and with what the DUT does: its tuning port is at 0 V (control output off), where the
    // relaxation DUT stalls, so the counter gives the SCPI not-a-number 9.91E37 (the old `> 0` passed anything).
    expect(Number(await q('MEAS:FREQ?'))).toBe(9.91e37);
    await counter.send('MEAS:FREQ?');
    await clock.advance(1);
    expect(counter.closedWith).toBeInstanceOf(Error);
  });

  it('delay a reply past a timeout', async () => {
    const { clock, q } = await setup([{ device: 'counter', type: 'delay', atReading: 1, delayS: 5 }]);
    const t0 = clock.now();
    await q('MEAS:FREQ?');
    expect(clock.now() - t0).toBeCloseTo(0.1 + 5, 9);
    const t1 = clock.now();
    await q('MEAS:FREQ?');
    expect(clock.now() - t1).toBeCloseTo(0.1, 9);
  });

  it('garbage instead of a reading, then normal again', async () => {
    const { q } = await setup([{ device: 'counter', type: 'garbage', atReading: 1 }]);
    const junk = await q('MEAS:FREQ?');
    expect(Number.isFinite(Number(junk))).toBe(false);
    expect(await q('MEAS:FREQ?')).toMatch(/^\+9\.91|^\+\d\.\d+E[+-]\d\d$/);
  });

  it('pushes an error onto the queue at a time', async () => {
    const { clock, q } = await setup([
      { device: 'counter', type: 'error', atS: 3, code: -350, message: 'Queue overflow' },
    ]);
    expect(await q('SYST:ERR?')).toBe('0,"No error"');
    await clock.advance(3);
    expect(await q('SYST:ERR?')).toBe('-350,"Queue overflow"');
  });

  it('stops answering for a while', async () => {
    const { clock, counter, q } = await setup([{ device: 'counter', type: 'silence', atS: 2, durationS: 10 }]);
    await clock.advance(3);
    await counter.send('*IDN?');
    await clock.advance(5);
    expect(counter.buffered).toBe(0);
    await clock.advance(5);
    expect(await q('*IDN?')).toMatch(/SIM-COUNTER/);
  });

  it('stops answering for good from a reading on', async () => {
    const { clock, counter, bench } = await setup([{ device: 'counter', type: 'silence', atReading: 1 }]);
    await counter.send('MEAS:FREQ?');
    await clock.advance(100);
    await counter.send('*IDN?');
    await clock.advance(100);
    expect(counter.buffered).toBe(0);
    expect(bench.faults.counter.fired.map((f) => f.type)).toEqual(['silence']);
  });
});
