import { connect, type Socket } from 'node:net';
import { afterEach, describe, expect, it } from 'vitest';
import type { Transport, TransportEvents } from '../instruments/transport.ts';
import { RealClock } from '../time/real-clock.ts';
import { LineClient } from './line-client.ts';
import { SCPI_NAN_TEXT } from './sim-counter.ts';
import { serveSimBench, type ServedSimBench } from './tcp-server.ts';

/** A bare socket as a Transport, enough for these tests (the real TCP transport lives in main/instruments/). */
function socketTransport(address: string): Transport {
  const m = /^tcp:\/\/([\d.]+):(\d+)$/.exec(address);
  if (!m) throw new Error(`bad address ${address}`);
  let socket: Socket | null = null;
  const data = new Set<TransportEvents['data']>();
  const close = new Set<TransportEvents['close']>();
  return {
    address,
    get isOpen() {
      return socket !== null && !socket.destroyed;
    },
    open: () =>
      new Promise<void>((resolve, reject) => {
        const s = connect(Number(m[2]), m[1] as string, () => resolve());
        s.once('error', reject);
        s.on('data', (chunk) => data.forEach((l) => l(new Uint8Array(chunk))));
        s.on('close', () => close.forEach((l) => l(new Error('remote closed'))));
        socket = s;
      }),
    write: (bytes) => new Promise<void>((resolve) => socket?.write(bytes, () => resolve())),
    close: async () => {
      socket?.destroy();
    },
    on(event, listener) {
      const set = (event === 'data' ? data : close) as Set<typeof listener>;
      set.add(listener);
      return () => set.delete(listener);
    },
  };
}

async function client(address: string): Promise<LineClient> {
  const c = new LineClient(socketTransport(address));
  await c.transport.open();
  return c;
}

const withTimeout = <T>(p: Promise<T>, ms: number): Promise<T | 'timeout'> =>
  Promise.race([p, new Promise<'timeout'>((resolve) => setTimeout(() => resolve('timeout'), ms))]);

let served: ServedSimBench | null = null;
afterEach(async () => {
  await served?.close();
  served = null;
});

describe('simulated bench over TCP loopback', () => {
  it('answers *IDN?, SYST:ERR?, -113, and the counter follows the control voltage down to the stall edge', async () => {
    served = await serveSimBench({
      host: '127.0.0.1',
      basePort: 0,
      dut: 'relaxation',
      seed: 9,
      clock: new RealClock(),
    });
    expect(served.addresses.supply).toMatch(/^tcp:\/\/127\.0\.0\.1:\d+$/);
    const supply = await client(served.addresses.supply);
    const counter = await client(served.addresses.counter);
    const thermo = await client(served.addresses.thermometer);
    expect(await supply.query('*IDN?')).toBe('tunebench,SIM-SUPPLY,0,0.1');
    expect(await supply.query('SYST:ERR?')).toBe('0,"No error"');
    await supply.send('NOT:A:COMMand 3');
    expect(await supply.query('SYST:ERR?')).toBe('-113,"Undefined header"');
    expect(await counter.query('*IDN?')).toBe('tunebench,SIM-COUNTER,0,0.1');
    expect(Number(await thermo.query('MEAS:TEMP?'))).toBeGreaterThan(15);

    await counter.send('SENS:FREQ:APER 0.02');
    await supply.send('SOUR1:VOLT 4;:OUTP1 ON');
    const readings: number[] = [];
    for (const v of [4, 3, 2, 1.7]) {
      await supply.send(`SOUR1:VOLT ${v}`);
      expect(Number(await supply.query('SOUR1:VOLT?'))).toBeCloseTo(v, 6);
      await new Promise((resolve) => setTimeout(resolve, 30)); // ≫ τ = 4 ms
      readings.push(Number(await counter.query('MEAS:FREQ?')));
    }
    // Relaxation oscillator: frequency falls with the control voltage.
    for (let i = 1; i < readings.length; i++) expect(readings[i]).toBeLessThan(readings[i - 1] as number);
    expect(readings[0]).toBeGreaterThan(20_000);
    await supply.send('SOUR1:VOLT 1.3'); // below the 1.55 V stall edge
    await new Promise((resolve) => setTimeout(resolve, 30));
    expect(await counter.query('MEAS:FREQ?')).toBe(SCPI_NAN_TEXT);
    await Promise.all([supply, counter, thermo].map((c) => c.transport.close()));
  });

  it('drop, delay, garbage, error and silence faults reach a TCP client', async () => {
    served = await serveSimBench({
      basePort: 0,
      seed: 4,
      faults: {
        faults: [
          { device: 'counter', type: 'garbage', atReading: 1 },
          { device: 'counter', type: 'delay', atReading: 2, delayS: 0.3 },
          { device: 'counter', type: 'drop', atReading: 3 },
          { device: 'thermometer', type: 'error', atReading: 1, code: -241, message: 'Hardware missing' },
          { device: 'supply', type: 'silence', atReading: 1, durationS: 0.4 },
        ],
      },
    });
    const counter = await client(served.addresses.counter);
    await counter.send('FREQ:APER 0.01');
    const junk = await counter.query('MEAS:FREQ?');
    expect(Number.isFinite(Number(junk))).toBe(false);
    const t0 = performance.now();
    const pending = counter.query('MEAS:FREQ?');
    expect(await withTimeout(pending, 200)).toBe('timeout');
    const late = await pending;
    expect(performance.now() - t0).toBeGreaterThanOrEqual(290);
    expect(late).toBe(SCPI_NAN_TEXT); // channel 1 starts off: stalled
    await counter.send('MEAS:FREQ?');
    await withTimeout(new Promise((resolve) => counter.transport.on('close', () => resolve(null))), 1000);
    expect(counter.closedWith).toBeInstanceOf(Error);
    const again = await client(served.addresses.counter);
    expect(await again.query('*IDN?')).toMatch(/SIM-COUNTER/);

    const thermo = await client(served.addresses.thermometer);
    await thermo.query('MEAS:TEMP?');
    expect(await thermo.query('SYST:ERR?')).toBe('-241,"Hardware missing"');

    const supply = await client(served.addresses.supply);
    expect(await supply.query('*IDN?')).toMatch(/SIM-SUPPLY/);
    // The first reading starts the silence: it and everything for 0.4 s go unanswered.
    expect(await withTimeout(supply.query('MEAS2:VOLT?'), 150)).toBe('timeout');
    await new Promise((resolve) => setTimeout(resolve, 400));
    // The swallowed query never gets an answer; a fresh query after the silence does.
    const supply2 = await client(served.addresses.supply);
    expect(await supply2.query('*IDN?')).toMatch(/SIM-SUPPLY/);
    await Promise.all([again, thermo, supply, supply2].map((c) => c.transport.close()));
  });
});
