/**
 * A short gain sweep through the bench assembly and the sweep procedure with
 * both instruments on Web Serial ports (fake ports on real web streams,
 * bridged to `tunebench sim` on 127.0.0.1, every reply split into 3-byte
 * reads), next to the same sweep over the desktop's TCP transport on the same
 * simulated bench: the transport must not change what is measured, and the
 * safe state must reach the simulated supply itself.
 */
import { afterEach, describe, expect, it } from 'vitest';
import { sweepPlanSchema, type BenchConfig } from '../../app/contract/plans.ts';
import { FakeSerialPort, FakeWebSerial, farEndOf } from '../instruments/testing/fake-web-serial.ts';
import { WebSerialTransport } from '../instruments/web-serial-transport.ts';
import { runSweep } from '../procedures/sweep.ts';
import { MemorySink } from '../procedures/testing/fake-bench.ts';
import { serveSimBench, type ServedSimBench } from '../sim/tcp-server.ts';
import { RealClock } from '../time/real-clock.ts';
import { SHORT_SWEEP } from '../../test/hostile/hostile-bench.ts';
import { assembleBench, type AssembleOptions } from './assemble.ts';

/** Three points on the relaxation DUT's oscillating range, two readings each. */
const plan = sweepPlanSchema.parse({ ...SHORT_SWEEP, readingsPerPoint: 2 });

let served: ServedSimBench | null = null;
afterEach(async () => {
  await served?.close();
  served = null;
});

async function sweepOn(config: BenchConfig, options: Partial<AssembleOptions> = {}) {
  const clock = new RealClock();
  const bench = await assembleBench(config, { clock, ...options });
  try {
    const sink = new MemorySink();
    const outcome = await runSweep({ bench, plan, clock, sink });
    return { outcome, rows: sink.rows, instruments: bench.instruments };
  } finally {
    await bench.close();
  }
}

describe('a gain sweep over Web Serial', () => {
  it('measures what the TCP transport measures, on the same simulated bench, and ends in the safe state', async () => {
    served = await serveSimBench({
      host: '127.0.0.1',
      basePort: 0,
      seed: 21,
      dut: 'relaxation',
      clock: new RealClock(),
    });
    const { addresses } = served;

    const serial = new FakeWebSerial();
    const supplyPort = new FakeSerialPort({
      far: farEndOf(addresses.supply),
      info: { usbVendorId: 0x0403, usbProductId: 0x6001 },
      chunkBytes: 3,
    });
    const counterPort = new FakeSerialPort({
      far: farEndOf(addresses.counter),
      info: { usbVendorId: 0x1a86, usbProductId: 0x7523 },
      chunkBytes: 3,
    });
    serial.ports.push(counterPort, supplyPort);
    const web = await sweepOn(
      {
        supply: { address: 'serial:usb-0403-6001?baud=115200', controlChannel: 1, dutSupplyChannel: 2 },
        counter: { address: 'serial:usb-1a86-7523?baud=115200' },
      },
      { serial: (address, role) => new WebSerialTransport({ serial, address, role }) },
    );
    expect(web.outcome.status).toBe('complete');
    expect(web.instruments?.map((i) => [i.role, i.idn])).toEqual([
      ['supply', 'tunebench,SIM-SUPPLY,0,0.1'],
      ['counter', 'tunebench,SIM-COUNTER,0,0.1'],
    ]);
    expect(supplyPort.opens[0]?.baudRate).toBe(115200);
    expect(counterPort.opens[0]?.baudRate).toBe(115200);
    // The safe state, read from the simulator itself: control channel at 0 V, output off.
    expect(served.bench.supply.state(1)).toMatchObject({ setpointV: 0, outputOn: false });
    // Both ports closed again (streams released), as after a desktop run.
    expect(supplyPort.readable).toBeNull();
    expect(counterPort.readable).toBeNull();

    const tcp = await sweepOn({
      supply: { address: addresses.supply, controlChannel: 1, dutSupplyChannel: 2 },
      counter: { address: addresses.counter },
    });
    expect(tcp.outcome.status).toBe('complete');

    const ok = (rows: typeof web.rows) => rows.filter((r) => r.status === 'ok');
    expect(ok(web.rows)).toHaveLength(6);
    expect(ok(tcp.rows)).toHaveLength(6);
    for (const [i, row] of ok(web.rows).entries()) {
      const ref = ok(tcp.rows)[i];
      expect(row.control_v).toBe(ref?.control_v);
      // The two runs are a second or two apart: the simulated DUT's warm-up (450 ppm, 480 s),
      // wander and white FM move it by tens of ppm at most, and a counter reading may differ by
      // its ±1 count at 1/gate (common practice); a garbled or misaligned reply would not fit.
      const refHz = Number(ref?.frequency_hz);
      expect(Math.abs(Number(row.frequency_hz) - refHz)).toBeLessThanOrEqual(1 / plan.gateS + 2e-4 * refHz);
    }
    // Tuning runs the right way on both: frequency rises with control voltage on this DUT.
    const f = ok(web.rows).map((r) => Number(r.frequency_hz));
    expect(f[5]).toBeGreaterThan(f[0] ?? Infinity);
  });
});
